import { asc, desc, eq, inArray, ne, sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { bikeModels, bikes, serviceItems, serviceRecords, sites } from '../db/schema';
import type { KmReading } from '../../shared/domain/usage';
import { addDaysIso, todayInZone } from '../../shared/domain/dates';
import { toKm } from '../../shared/domain/units';

/** Everything the due computation needs for a set of bikes, read in a few set-based queries. */
export interface DueInputs {
  bikes: (typeof bikes.$inferSelect & { timeZone: string; siteName: string; modelName: string; today: string })[];
  itemsByModel: Map<string, (typeof serviceItems.$inferSelect)[]>;
  /** Per bike: the readings that decide its current km and its usage (window extremes, first, highest). */
  readings: Map<string, KmReading[]>;
  /** Per bike and item: the last time it was done. */
  lastDone: Map<string, { date: string; odometerKm: number }>;
}

export const doneKey = (bikeId: string, itemId: string) => `${bikeId}:${itemId}`;

const USAGE_WINDOW_DAYS = 90;

export async function loadDueInputs(db: DbOrTx, now: Date, bikeIds?: string[]): Promise<DueInputs> {
  const scope = bikeIds ? inArray(bikes.id, bikeIds) : ne(bikes.status, 'retired');
  const bikeRows = await db
    .select({ bike: bikes, timeZone: sites.timeZone, siteName: sites.name, modelName: bikeModels.name })
    .from(bikes)
    .innerJoin(sites, eq(sites.id, bikes.siteId))
    .innerJoin(bikeModels, eq(bikeModels.id, bikes.modelId))
    .where(scope);
  const list = bikeRows.map((r) => ({ ...r.bike, timeZone: r.timeZone, siteName: r.siteName, modelName: r.modelName, today: todayInZone(r.timeZone, now) }));
  const ids = list.map((b) => b.id);
  const readings = new Map<string, KmReading[]>(ids.map((id) => [id, []]));
  const lastDone = new Map<string, { date: string; odometerKm: number }>();
  const itemsByModel = new Map<string, (typeof serviceItems.$inferSelect)[]>();
  if (!ids.length) return { bikes: list, itemsByModel, readings, lastDone };

  const modelIds = [...new Set(list.map((b) => b.modelId))];
  for (const it of await db.select().from(serviceItems).where(inArray(serviceItems.modelId, modelIds)).orderBy(asc(serviceItems.name))) {
    itemsByModel.set(it.modelId, [...(itemsByModel.get(it.modelId) ?? []), it]);
  }

  const earliestToday = list.reduce((m, b) => (b.today < m ? b.today : m), list[0].today);
  const windowStart = addDaysIso(earliestToday, -USAGE_WINDOW_DAYS - 1);
  const latestToday = list.reduce((m, b) => (b.today > m ? b.today : m), list[0].today);
  // Per bike, the few readings that decide its current km and its usage, each an index probe:
  // the first ever, the first two inside the usage window, the last up to today, the highest.
  const probe = (where: SQL, order: SQL, limit = 1) =>
    sql`select r.date::text as day, r.odometer_km as km from odometer_readings r where r.bike_id = b.id and ${where} order by ${order} limit ${limit}`;
  const { rows } = (await db.execute(sql`
    select b.id as bike_id, p.day, p.km from bikes b
    cross join lateral (
      (${probe(sql`true`, sql`r.date, r.odometer_km`)})
      union all (${probe(sql`r.date > ${windowStart}`, sql`r.date, r.odometer_km`, 2)})
      union all (${probe(sql`r.date <= ${latestToday}`, sql`r.date desc, r.odometer_km desc`)})
      union all (${probe(sql`true`, sql`r.odometer_km desc`)})
    ) p
    where b.id in (${sql.join(ids.map((id) => sql`${id}`), sql`, `)})`)) as unknown as { rows: { bike_id: string; day: string; km: number }[] };
  for (const r of rows) readings.get(r.bike_id)?.push({ date: r.day, odometerKm: Number(r.km) });
  for (const b of list) {
    const r = readings.get(b.id)!;
    if (!r.length) r.push({ date: b.inServiceDate, odometerKm: toKm(b.inServiceOdometer, b.odometerUnit) });
  }

  const done = await db
    .selectDistinctOn([serviceRecords.bikeId, serviceRecords.serviceItemId], {
      bikeId: serviceRecords.bikeId,
      itemId: serviceRecords.serviceItemId,
      date: serviceRecords.date,
      odometerKm: serviceRecords.odometerKm,
    })
    .from(serviceRecords)
    .where(bikeIds ? inArray(serviceRecords.bikeId, ids) : sql`true`)
    .orderBy(serviceRecords.bikeId, serviceRecords.serviceItemId, desc(serviceRecords.date), desc(serviceRecords.odometerKm));
  for (const d of done) lastDone.set(doneKey(d.bikeId, d.itemId), { date: d.date, odometerKm: d.odometerKm });
  return { bikes: list, itemsByModel, readings, lastDone };
}
