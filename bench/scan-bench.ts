import type { Database } from '../server/db/client';
import { loadDueInputs } from '../server/services/due-data';
import { applyDue, computeAll } from '../server/services/due';
import { valveWarningsFor } from '../server/services/valve-warnings';
import { addDaysIso, todayInZone } from '../shared/domain/dates';
import { scan as dueScan } from '../jobs/due-scan';
import type { JobDeps } from '../jobs/types';
import type { RawSql } from './raw-sql';

export const jobDeps = (database: Database): JobDeps => ({
  db: database.db,
  now: () => new Date(),
  mail: {
    transport: () => {
      throw new Error('The benchmark sends no mail.');
    },
    from: 'Lashline <lashline@localhost>',
  },
  publicUrl: 'http://127.0.0.1',
  log: () => {},
});

/** The real job, timed from the outside. */
export async function timedScan(database: Database) {
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  const result = await dueScan(jobDeps(database));
  const ms = performance.now() - t0;
  return { ms, cpuMs: cpuMs(cpu0), summary: result.summary, tasksRaised: Number(result.tasksRaised), bikes: Number(result.bikes) };
}

/** CPU time this process spent since `from`: far below the wall time means it waited (for the disk, or for a busy machine). */
export const cpuMs = (from: NodeJS.CpuUsage) => {
  const d = process.cpuUsage(from);
  return (d.user + d.system) / 1000;
};

/** The same work in its parts, to see where the time goes. */
export async function scanParts(database: Database) {
  const db = database.db;
  const now = new Date();
  const lap = (() => {
    let t = performance.now();
    return () => {
      const n = performance.now();
      const ms = n - t;
      t = n;
      return ms;
    };
  })();
  const inputs = await loadDueInputs(db, now);
  const loadMs = lap();
  const computed = computeAll(inputs);
  const computeMs = lap();
  await db.transaction((tx) => applyDue(tx, computed, now));
  const applyMs = lap();
  await valveWarningsFor(db, [...new Set(inputs.bikes.map((b) => b.siteId))]);
  const warningsMs = lap();
  let readings = 0;
  for (const r of inputs.readings.values()) readings += r.length;
  return { loadMs, computeMs, applyMs, warningsMs, computed: computed.length, readingsLoaded: readings, serviceLasts: inputs.lastDone.size };
}

/**
 * The floor: one statement that reads what the scan needs (each bike's latest and first reading,
 * its readings in the 90-day usage window, the last service of each item) with the existing
 * indexes, and hands the rows back; no computation and no writes.
 */
export const FLOOR_SQL = `
with b as (select id, model_id from bikes where status <> 'retired')
select 'latest' as k, b.id as bike_id, null::uuid as item_id, r.date, r.odometer_km from b
  cross join lateral (select date, odometer_km from odometer_readings o where o.bike_id = b.id
                      order by o.date desc, o.odometer_km desc limit 1) r
union all
select 'first', b.id, null, r.date, r.odometer_km from b
  cross join lateral (select date, odometer_km from odometer_readings o where o.bike_id = b.id
                      order by o.date, o.odometer_km limit 1) r
union all
select 'window', o.bike_id, null, o.date, o.odometer_km from b
  join odometer_readings o on o.bike_id = b.id and o.date > $1::date
union all
select 'done', b.id, i.id, s.date, s.odometer_km from b
  join service_items i on i.model_id = b.model_id
  cross join lateral (select date, odometer_km from service_records s where s.bike_id = b.id and s.service_item_id = i.id
                      order by s.date desc, s.odometer_km desc limit 1) s`;

/**
 * A leaner floor: only the readings the due computation can use (per bike the first ever, the
 * first two in the window, the last up to today and the highest, each one index probe) and the
 * last service per item.
 */
export const LEAN_FLOOR_SQL = `
with b as (select id, model_id from bikes where status <> 'retired')
select b.id as bike_id, null::uuid as item_id, p.date, p.odometer_km from b
  cross join lateral (
    (select r.date, r.odometer_km from odometer_readings r where r.bike_id = b.id order by r.date, r.odometer_km limit 1)
    union all (select r.date, r.odometer_km from odometer_readings r where r.bike_id = b.id and r.date > $1::date order by r.date, r.odometer_km limit 2)
    union all (select r.date, r.odometer_km from odometer_readings r where r.bike_id = b.id and r.date <= $2::date order by r.date desc, r.odometer_km desc limit 1)
    union all (select r.date, r.odometer_km from odometer_readings r where r.bike_id = b.id order by r.odometer_km desc limit 1)
  ) p
union all
select b.id, i.id, s.date, s.odometer_km from b
  join service_items i on i.model_id = b.model_id
  cross join lateral (select date, odometer_km from service_records s where s.bike_id = b.id and s.service_item_id = i.id
                      order by s.date desc, s.odometer_km desc limit 1) s`;

/** The same window start the scan uses: the earliest site date, 91 days back. */
export async function floorDates(raw: RawSql) {
  const zones = await raw.query<{ time_zone: string }>('select distinct time_zone from sites');
  const now = new Date();
  const days = zones.map((z) => todayInZone(z.time_zone, now)).sort();
  const earliest = days[0] ?? todayInZone('Europe/London', now);
  return { windowStart: addDaysIso(earliest, -91), latestToday: days[days.length - 1] ?? earliest };
}

export async function timedFloor(raw: RawSql) {
  const { windowStart, latestToday } = await floorDates(raw);
  const t0 = performance.now();
  const rows = await raw.query(FLOOR_SQL, [windowStart]);
  const ms = performance.now() - t0;
  const t1 = performance.now();
  const lean = await raw.query(LEAN_FLOOR_SQL, [windowStart, latestToday]);
  return { ms, rows: rows.length, leanMs: performance.now() - t1, leanRows: lean.length };
}
