import { createServer } from 'node:http';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { existsSync } from 'node:fs';
import { parseArgs } from 'node:util';
import express, { type Express } from 'express';
import { createApp } from '../server/app';
import { testConfig } from '../server/config';
import { openDatabase } from '../server/db/client';
import { lockDataDir } from '../server/db/data-dir-lock';
import { rawSql, statementRecorder } from './raw-sql';
import { cpuProfiler } from './cpu-profile';
import { scanParts, timedFloor, timedScan } from './scan-bench';
import { checkInTargets, countExisting, explain, readingCount, timedInsertFloor, timedListDue } from './direct-bench';
import { planPhase } from './plan-bench';
import { partSites, seedPartsCatalogue, timedForecast, timedStock } from './parts-bench';

/**
 * The server under test, in its own process: the real app over the generated data, plus the
 * measurements that go straight to the database. The runner drives it over IPC.
 */

const { values } = parseArgs({ options: { data: { type: 'string' }, dist: { type: 'string' } } });
const databaseUrl = process.env.DATABASE_URL || undefined;
const unlock = databaseUrl ? () => {} : lockDataDir(values.data!, 'the Lashline benchmark');
const t0 = performance.now();
const database = await openDatabase(databaseUrl ? { databaseUrl } : { dataDir: values.data });
const openMs = performance.now() - t0;
const recorder = statementRecorder(database);
const raw = rawSql(database, databaseUrl);

const dist = values.dist;
const serveDist = (app: Express) => {
  if (!dist || !existsSync(`${dist}/index.html`)) return;
  app.use(express.static(dist, { index: false, maxAge: '1h' }));
  // Relative to a root: an absolute path through bench/.data would be refused as a dot-file path.
  app.get('/{*splat}', (_req, res) => res.sendFile('index.html', { root: dist }));
};
const app = createApp({ database, config: testConfig({ LOG_LEVEL: 'error' }), sessionSecret: 'bench-session-secret-bench', client: serveDist });
// A request counts until its handler ends the response: a client that hangs up early (autocannon at
// the end of a timed run) closes the socket long before the handler has finished its work.
let inFlight = 0;
const server = createServer((req, res) => {
  inFlight++;
  const end = res.end.bind(res) as (...a: unknown[]) => typeof res;
  let ended = false;
  res.end = ((...a: unknown[]) => {
    if (!ended) inFlight--;
    ended = true;
    return end(...a);
  }) as typeof res.end;
  app(req, res);
});
await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
const port = (server.address() as { port: number }).port;

const memory = () => {
  const m = process.memoryUsage();
  return { rss: m.rss, heapUsed: m.heapUsed, external: m.external, maxRss: process.resourceUsage().maxRSS * 1024 };
};

const loopDelay = monitorEventLoopDelay({ resolution: 10 });
const profiler = cpuProfiler();

type Handler = (args: Record<string, unknown>) => Promise<unknown> | unknown;
const handlers: Record<string, Handler> = {
  scan: () => timedScan(database),
  scanParts: () => scanParts(database),
  plan: (a) => planPhase(database, Number(a.bikes)),
  seedParts: () => seedPartsCatalogue(database),
  partSites: () => partSites(database),
  forecast: (a) => timedForecast(database, String(a.siteId), Number(a.weeks ?? 8)),
  stock: (a) => timedStock(database, String(a.siteId)),
  floor: () => timedFloor(raw),
  listDue: (a) => timedListDue(database, { maxRuns: Number(a.maxRuns ?? 50), maxMs: Number(a.maxMs ?? 8000) }),
  checkInTargets: () => checkInTargets(raw),
  insertFloor: async (a) => timedInsertFloor(database, await checkInTargets(raw), { maxMs: Number(a.maxMs ?? 3000) }),
  readings: () => readingCount(raw),
  existing: (a) => countExisting(raw, a.ids as string[]),
  inFlight: () => inFlight,
  explain: (a) => explain(raw, String(a.sql), (a.params as unknown[]) ?? []),
  recordStart: () => recorder.start(),
  recordStop: () => recorder.stop(),
  memory,
  pid: () => process.pid,
  /** After a full garbage collection (the worker runs with --expose-gc): what the server really holds. */
  memoryAfterGc: async () => {
    const gc = (globalThis as { gc?: () => void }).gc;
    if (!gc) throw new Error('Start the benchmark server with --expose-gc to measure memory after a collection.');
    gc();
    await new Promise((r) => setTimeout(r, 200));
    gc();
    return memory();
  },
  cpuStart: () => profiler.start(),
  cpuStop: () => profiler.stop(),
  loopDelayStart: () => {
    loopDelay.reset();
    loopDelay.enable();
  },
  loopDelayStop: () => {
    loopDelay.disable();
    return { max: loopDelay.max / 1e6, p99: loopDelay.percentile(99) / 1e6 };
  },
  stop: async () => {
    server.closeAllConnections();
    await new Promise<void>((r) => server.close(() => r()));
    await raw.close();
    await database.close();
    unlock();
    setImmediate(() => process.exit(0));
  },
};

process.on('message', (m: { id: number; cmd: string; args?: Record<string, unknown> }) => {
  Promise.resolve()
    .then(() => {
      const h = handlers[m.cmd];
      if (!h) throw new Error(`No benchmark command ${m.cmd}`);
      return h(m.args ?? {});
    })
    .then(
      (result) => process.send!({ id: m.id, ok: true, result }),
      (e: unknown) => process.send!({ id: m.id, ok: false, error: e instanceof Error ? `${e.message}\n${e.stack}` : String(e) }),
    );
});
process.on('disconnect', () => {
  void database.close().finally(() => {
    unlock();
    process.exit(1);
  });
});
process.send!({ ready: true, port, openMs, memory: memory() });
