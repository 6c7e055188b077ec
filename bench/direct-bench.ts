import { eq, inArray } from 'drizzle-orm';
import type { Database } from '../server/db/client';
import { odometerReadings, userSites, users } from '../server/db/schema';
import { listDue } from '../server/services/due-list';
import { MANAGER_EMAIL } from './args';
import type { RawSql } from './raw-sql';

export async function managerSites(database: Database) {
  const rows = await database.db
    .select({ userId: users.id, siteId: userSites.siteId })
    .from(users)
    .innerJoin(userSites, eq(userSites.userId, users.id))
    .where(eq(users.email, MANAGER_EMAIL));
  return { userId: rows[0]?.userId ?? null, siteIds: rows.map((r) => r.siteId) };
}

/** The due list the API serves, called straight on the database as often as fits in the time given. */
export async function timedListDue(database: Database, opts: { maxRuns: number; maxMs: number }) {
  const { siteIds } = await managerSites(database);
  const times: number[] = [];
  let items = 0;
  const until = performance.now() + opts.maxMs;
  while (times.length < opts.maxRuns && (times.length < 5 || performance.now() < until)) {
    const t0 = performance.now();
    items = (await listDue(database.db, siteIds, { within: 7 }, new Date())).length;
    times.push(performance.now() - t0);
  }
  return { times, items };
}

/** Each bike's latest odometer value: the check-in load starts above it. */
export async function checkInTargets(raw: RawSql) {
  return raw.query<{ id: string; value: number }>(
    `select distinct on (bike_id) bike_id as id, value from odometer_readings order by bike_id, date desc, odometer_km desc`,
  );
}

/**
 * The check-in floor: one odometer row written in its own transaction, straight to the database,
 * as many times as fit in the time given; the rows are removed afterwards.
 */
export async function timedInsertFloor(database: Database, bikes: { id: string; value: number }[], opts: { maxMs: number }) {
  const { userId } = await managerSites(database);
  const today = new Date().toISOString().slice(0, 10);
  const ids: string[] = [];
  const t0 = performance.now();
  for (let i = 0; performance.now() - t0 < opts.maxMs; i++) {
    const b = bikes[i % bikes.length];
    const value = b.value + 1_000 + i;
    const [row] = await database.db.transaction((tx) =>
      tx
        .insert(odometerReadings)
        .values({ bikeId: b.id, date: today, value, unit: 'km', odometerKm: value, source: 'check-in', recordedBy: userId })
        .returning({ id: odometerReadings.id }),
    );
    ids.push(row.id);
  }
  const seconds = (performance.now() - t0) / 1000;
  for (let i = 0; i < ids.length; i += 1000) await database.db.delete(odometerReadings).where(inArray(odometerReadings.id, ids.slice(i, i + 1000)));
  return { rows: ids.length, perSecond: ids.length / seconds };
}

export async function readingCount(raw: RawSql) {
  const [{ n }] = await raw.query<{ n: number }>('select count(*)::int as n from odometer_readings');
  return n;
}

export async function countExisting(raw: RawSql, ids: string[]) {
  let n = 0;
  for (let i = 0; i < ids.length; i += 5000) {
    const [r] = await raw.query<{ n: number }>('select count(*)::int as n from odometer_readings where id = any($1::uuid[])', [ids.slice(i, i + 5000)]);
    n += r.n;
  }
  return n;
}

/** A statement's plan; SELECTs are run (EXPLAIN ANALYZE), writes only planned. */
export async function explain(raw: RawSql, sql: string, params: unknown[]) {
  const analyze = /^\s*(select|with)\b/i.test(sql) && !/\b(insert|update|delete)\b/i.test(sql);
  const rows = await raw.query<{ 'QUERY PLAN': string }>(`explain (${analyze ? 'analyze, buffers, ' : ''}costs) ${sql}`, params);
  return rows.map((r) => r['QUERY PLAN']).join('\n');
}
