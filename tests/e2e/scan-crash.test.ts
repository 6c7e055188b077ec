import { afterAll, describe, expect, it } from 'vitest';
import { cp, mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { sql } from 'drizzle-orm';
import { generateFleet } from '../../bench/generate';
import { londonToday } from '../../server/demo/seed';
import { openDatabase, type Database } from '../../server/db/client';
import { run as dueScan } from '../../jobs/due-scan';
import { startDemoServer } from './support';

// The server killed (SIGKILL: no clean-up of any kind) in the middle of the due scan that its
// start-up catch-up runs, then started again. The second start must claim the same time slot at
// once and leave exactly what an uninterrupted scan leaves: no task twice, no half-written states.

const BIKES = 600;
const today = londonToday();

/** What a scan leaves behind, in a form two databases can be compared by. */
async function outcome(database: Database) {
  const rows = async <R>(q: ReturnType<typeof sql>) => ((await database.db.execute(q)) as unknown as { rows: R[] }).rows;
  const [states] = await rows<{ n: number; md5: string }>(
    sql`select count(*)::int as n, md5(coalesce(string_agg(concat_ws('|', bike_id, service_item_id, status, due_at_km, due_by_date, due_date, trigger, remaining_km, remaining_days, baseline_date, baseline_km), ',' order by bike_id, service_item_id), '')) as md5 from due_states`,
  );
  const [tasks] = await rows<{ n: number; md5: string }>(
    sql`select count(*)::int as n, md5(coalesce(string_agg(concat_ws('|', bike_id, service_item_id, cycle_key, status, origin, assignee_id, due_date, estimated_minutes), ',' order by bike_id, service_item_id, cycle_key), '')) as md5 from service_tasks`,
  );
  const [twice] = await rows<{ n: number }>(sql`select count(*)::int as n from (select 1 from service_tasks group by bike_id, service_item_id, cycle_key having count(*) > 1) x`);
  const [grounded] = await rows<{ n: number }>(sql`select count(*)::int as n from bikes where status = 'out_of_service'`);
  return { states, tasks, tasksTwice: twice.n, grounded: grounded.n };
}

async function scanRuns(database: Database) {
  return ((await database.db.execute(sql`select slot, owner, finished_at from job_runs where job = 'due-scan' order by slot`)) as unknown as {
    rows: { slot: string; owner: string | null; finished_at: string | null }[];
  }).rows;
}

/** Starts the server on the fleet and resolves when the log says the due scan began. */
async function startUntilScan(where: { dataDir?: string; databaseUrl?: string }) {
  const env: Record<string, string> = { SCHEDULER: 'on', LOG_LEVEL: 'info' };
  if (where.databaseUrl) env.DATABASE_URL = where.databaseUrl;
  let log = '';
  const server = await startDemoServer(env, where.dataDir ?? (await mkdtemp(join(tmpdir(), 'lashline-crash-pg-'))));
  const listenedAt = Date.now();
  const started = new Promise<{ slot: string; afterMs: number }>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`The due scan did not start:\n${log}`)), 30_000);
    const onData = (b: Buffer) => {
      log += b.toString();
      // The server logs JSON lines: the slot ends at the message's closing quote.
      const m = /\[due-scan\] started for the slot of ([^\s"]+)/.exec(log);
      if (m) {
        clearTimeout(timer);
        resolve({ slot: m[1], afterMs: Date.now() - listenedAt });
      }
    };
    server.proc.stdout!.on('data', onData);
    server.proc.stderr!.on('data', onData);
  });
  const finished = new Promise<string>((resolve) => {
    const onData = () => {
      const m = /\[due-scan\] (Scanned [^"\n]*)/.exec(log);
      if (m) resolve(m[1]);
    };
    server.proc.stdout!.on('data', onData);
  });
  return { server, started, finished, log: () => log };
}

async function killMidScan(where: { dataDir?: string; databaseUrl?: string }, open: () => Promise<Database>) {
  // Killed a little after it began: inside its reads or its write transaction.
  const first = await startUntilScan(where);
  const { slot } = await first.started;
  await new Promise((r) => setTimeout(r, 150));
  first.server.signal('SIGKILL');
  await first.server.exited;
  const afterKill = await open();
  const runs = await scanRuns(afterKill);
  await afterKill.close();
  // The kill landed before the scan finished: its slot is claimed and unfinished.
  expect(runs.find((r) => r.slot === slot)?.finished_at, `the scan finished before the kill:\n${first.log()}`).toBeNull();

  const second = await startUntilScan(where);
  const again = await second.started;
  expect(again.slot).toBe(slot);
  // Claimed at once: the catch-up runs right after start-up, not after a stale-claim timeout.
  expect(again.afterMs).toBeLessThan(10_000);
  const summary = await second.finished;
  await second.server.stop();
  return summary;
}

describe('a due scan killed halfway', () => {
  const cleanup: (() => Promise<void>)[] = [];
  afterAll(async () => {
    for (const c of cleanup.reverse()) await c().catch(() => {});
  });

  it('on embedded PGlite: the restarted server claims the slot at once and ends as an uninterrupted scan would', async () => {
    const root = await mkdtemp(join(tmpdir(), 'lashline-crash-'));
    cleanup.push(() => rm(root, { recursive: true, force: true }));
    const dataDir = join(root, 'live');
    await generateFleet({ bikes: BIKES, seed: 'scan-crash', today, dataDir });
    // The same fleet, scanned once without interruption, is what the killed one must end as.
    await cp(dataDir, join(root, 'reference'), { recursive: true });
    const reference = await openDatabase({ dataDir: join(root, 'reference') });
    await dueScan({ db: reference.db, now: () => new Date(), mail: { transport: () => { throw new Error('no mail'); }, from: 'x' }, publicUrl: '', log: () => {} });
    const expected = await outcome(reference);
    await reference.close();

    const summary = await killMidScan({ dataDir }, () => openDatabase({ dataDir }));
    expect(summary).toMatch(/Scanned 600 bikes/);
    const live = await openDatabase({ dataDir });
    const got = await outcome(live);
    const runs = await scanRuns(live);
    await live.close();
    expect(got.tasksTwice).toBe(0);
    expect(got.tasks.n).toBeGreaterThan(0);
    expect(got).toEqual(expected);
    expect(runs.every((r) => r.finished_at !== null)).toBe(true);
  }, 240_000);

  it.skipIf(!process.env.TEST_DATABASE_URL)('on PostgreSQL: the same, with the run held by a row lock that dies with the process', async () => {
    const admin = new pg.Client({ connectionString: process.env.TEST_DATABASE_URL });
    admin.on('error', () => {});
    await admin.connect();
    const name = `lashline_crash_${process.pid}`;
    const urlOf = (db: string) => {
      const u = new URL(process.env.TEST_DATABASE_URL!);
      u.pathname = `/${db}`;
      return u.toString();
    };
    for (const db of [name, `${name}_ref`]) await admin.query(`drop database if exists ${db}`);
    await admin.query(`create database ${name}`);
    cleanup.push(async () => {
      for (const db of [name, `${name}_ref`]) await admin.query(`drop database if exists ${db} with (force)`);
      await admin.end();
    });
    const databaseUrl = urlOf(name);
    await generateFleet({ bikes: BIKES, seed: 'scan-crash', today, databaseUrl });
    await admin.query(`create database ${name}_ref template ${name}`);
    const reference = await openDatabase({ databaseUrl: urlOf(`${name}_ref`) });
    await dueScan({ db: reference.db, now: () => new Date(), mail: { transport: () => { throw new Error('no mail'); }, from: 'x' }, publicUrl: '', log: () => {} });
    const expected = await outcome(reference);
    await reference.close();

    const summary = await killMidScan({ databaseUrl }, () => openDatabase({ databaseUrl, migrate: false }));
    expect(summary).toMatch(/Scanned 600 bikes/);
    const live = await openDatabase({ databaseUrl, migrate: false });
    const got = await outcome(live);
    const runs = await scanRuns(live);
    await live.close();
    expect(got.tasksTwice).toBe(0);
    expect(got.tasks.n).toBeGreaterThan(0);
    expect(got).toEqual(expected);
    expect(runs.every((r) => r.finished_at !== null)).toBe(true);
  }, 240_000);
});

