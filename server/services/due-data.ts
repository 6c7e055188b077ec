import { asc, inArray, sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { jsonTuples, sqlList } from '../db/json-rows';
import { serviceItems } from '../db/schema';
import type { KmReading } from '../../shared/domain/usage';
import { addDaysIso, todayInZone } from '../../shared/domain/dates';
import { toKm, type OdometerUnit } from '../../shared/domain/units';

/** What the due computation needs of a bike. */
export interface DueBike {
  id: string;
  fleetNumber: string;
  siteId: string;
  modelId: string;
  inServiceDate: string;
  inServiceOdometer: number;
  odometerUnit: OdometerUnit;
  timeZone: string;
  /** The calendar date at the bike's site when the inputs were read. */
  today: string;
}

/** Everything the due computation needs for a set of bikes, read in a few set-based queries. */
export interface DueInputs {
  bikes: DueBike[];
  itemsByModel: Map<string, (typeof serviceItems.$inferSelect)[]>;
  /** Per bike: the readings that decide its current km and its usage (window extremes, first, highest). */
  readings: Map<string, KmReading[]>;
  /** Per bike and item: the last time it was done. */
  lastDone: Map<string, { date: string; odometerKm: number }>;
}

export const doneKey = (bikeId: string, itemId: string) => `${bikeId}:${itemId}`;

const USAGE_WINDOW_DAYS = 90;

/**
 * Reads the inputs for the given bikes, or for every bike not retired. Rows come back as JSON
 * (see jsonTuples): at thousands of bikes that is most of the time saved on embedded PGlite.
 */
export async function loadDueInputs(db: DbOrTx, now: Date, bikeIds?: string[]): Promise<DueInputs> {
  const scope = bikeIds ? sql`b.id in (${sqlList(bikeIds)})` : sql`b.status <> 'retired'`;
  const bikeRows = await jsonTuples<[string, string, string, string, number, OdometerUnit, string, string]>(
    db,
    sql`select json_build_array(b.id, b.site_id, b.model_id, b.in_service_date, b.in_service_odometer, b.odometer_unit, s.time_zone, b.fleet_number) as a
          from bikes b join sites s on s.id = b.site_id where ${scope}`,
  );
  // One calendar date per time zone, not per bike.
  const todays = new Map<string, string>();
  const today = (zone: string) => todays.get(zone) ?? todays.set(zone, todayInZone(zone, now)).get(zone)!;
  const list: DueBike[] = bikeRows.map(([id, siteId, modelId, inServiceDate, inServiceOdometer, odometerUnit, timeZone, fleetNumber]) => ({
    id, fleetNumber, siteId, modelId, inServiceDate, inServiceOdometer, odometerUnit, timeZone, today: today(timeZone),
  }));
  const ids = list.map((b) => b.id);
  const readings = new Map<string, KmReading[]>(ids.map((id) => [id, []]));
  const lastDone = new Map<string, { date: string; odometerKm: number }>();
  const itemsByModel = new Map<string, (typeof serviceItems.$inferSelect)[]>();
  if (!ids.length) return { bikes: list, itemsByModel, readings, lastDone };

  const modelIds = [...new Set(list.map((b) => b.modelId))];
  for (const it of await db.select().from(serviceItems).where(inArray(serviceItems.modelId, modelIds)).orderBy(asc(serviceItems.name))) {
    itemsByModel.set(it.modelId, [...(itemsByModel.get(it.modelId) ?? []), it]);
  }

  const dates = [...todays.values()].sort();
  const windowStart = addDaysIso(dates[0], -USAGE_WINDOW_DAYS - 1);
  const latestToday = dates[dates.length - 1];
  // Per bike, the few readings that decide its current km and its usage, each an index probe:
  // the first ever, the first two inside the usage window, the last up to today, the highest.
  const probe = (where: SQL, order: SQL, limit = 1) =>
    sql`select r.date as day, r.odometer_km as km from odometer_readings r where r.bike_id = b.id and ${where} order by ${order} limit ${limit}`;
  const probed = await jsonTuples<[string, string, number]>(
    db,
    sql`select json_build_array(b.id, p.day, p.km) as a from bikes b
        cross join lateral (
          (${probe(sql`true`, sql`r.date, r.odometer_km`)})
          union all (${probe(sql`r.date > ${windowStart}`, sql`r.date, r.odometer_km`, 2)})
          union all (${probe(sql`r.date <= ${latestToday}`, sql`r.date desc, r.odometer_km desc`)})
          union all (${probe(sql`true`, sql`r.odometer_km desc`)})
        ) p
        where ${scope}`,
  );
  for (const [bikeId, date, km] of probed) readings.get(bikeId)?.push({ date, odometerKm: Number(km) });
  for (const b of list) {
    const r = readings.get(b.id)!;
    if (!r.length) r.push({ date: b.inServiceDate, odometerKm: toKm(b.inServiceOdometer, b.odometerUnit) });
  }

  // The last service of each item of each bike's model: one index probe per pair, so the cost
  // follows the fleet's size, not the years of history behind it.
  const done = await jsonTuples<[string, string, string, number]>(
    db,
    sql`select json_build_array(b.id, i.id, l.date, l.odometer_km) as a
          from bikes b join service_items i on i.model_id = b.model_id
         cross join lateral (select d.date, d.odometer_km from service_records d
                              where d.bike_id = b.id and d.service_item_id = i.id
                              order by d.date desc, d.odometer_km desc limit 1) l
         where ${scope}`,
  );
  for (const [bikeId, itemId, date, odometerKm] of done) lastDone.set(doneKey(bikeId, itemId), { date, odometerKm });
  return { bikes: list, itemsByModel, readings, lastDone };
}
