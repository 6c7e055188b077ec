import { and, asc, desc, eq, gt, inArray, ne, sql } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { bikeModels, bikes, odometerReadings, serviceItems, serviceRecords, sites } from '../db/schema';
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
  const inScope = bikeIds ? inArray(odometerReadings.bikeId, ids) : sql`true`;
  const add = (rows: { bikeId: string; date: string; odometerKm: number }[]) => {
    for (const r of rows) readings.get(r.bikeId)?.push({ date: r.date, odometerKm: r.odometerKm });
  };
  const cols = { bikeId: odometerReadings.bikeId, date: odometerReadings.date, odometerKm: odometerReadings.odometerKm };
  // Recent readings for the usage window, then each bike's first reading and its highest one.
  add(await db.select(cols).from(odometerReadings).where(and(inScope, gt(odometerReadings.date, windowStart))));
  add(
    await db
      .selectDistinctOn([odometerReadings.bikeId], cols)
      .from(odometerReadings)
      .where(inScope)
      .orderBy(odometerReadings.bikeId, asc(odometerReadings.date), asc(odometerReadings.odometerKm)),
  );
  add(
    await db
      .selectDistinctOn([odometerReadings.bikeId], cols)
      .from(odometerReadings)
      .where(inScope)
      .orderBy(odometerReadings.bikeId, desc(odometerReadings.odometerKm)),
  );
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
