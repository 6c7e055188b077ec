import { and, eq, inArray, sql } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { jsonTuples, sqlList } from '../db/json-rows';
import { bikeModels, bikes } from '../db/schema';
import { valveHistories, valveLayout, type StoredValveReading } from '../../shared/domain/valves';
import { clearanceTrend } from '../../shared/domain/trend';
import type { ValveTrendView } from '../../shared/schemas/valves';
import { toModelSummary } from './models';
import { dueAtKmFor } from '../../shared/domain/due';
import { toKm, type OdometerUnit } from '../../shared/domain/units';
import { doneKey, type DueInputs } from './due-data';

const mm = (um: number | null) => (um == null ? null : um / 1000);

type ReadingTuple = [string, string, number, number, 'intake' | 'exhaust', number, number, number | null, number | null, number | null];

/** Every stored valve reading of the given bikes (or of their sites), in micrometres turned to mm, lowest km first. */
export async function readingsForBikes(db: DbOrTx, bikeIds: string[], siteIds?: string[]) {
  const by = new Map<string, StoredValveReading[]>();
  if (!bikeIds.length) return by;
  const scope = sql`c.bike_id in (${siteIds ? sql`select id from bikes where site_id in (${sqlList(siteIds)})` : sqlList(bikeIds)})`;
  const rows = await jsonTuples<ReadingTuple>(
    db,
    sql`select json_build_array(c.bike_id, c.date, c.odometer_km, r.cylinder, r.side, r.position, r.as_found_um, r.as_left_um, r.shim_before_um, r.shim_after_um) as a,
               c.odometer_km as km, c.date as day, r.cylinder, r.side, r.position
          from valve_readings r join valve_checks c on c.id = r.check_id
         where ${scope}`,
    sql`q.km, q.day, q.cylinder, q.side, q.position`,
  );
  for (const [bikeId, date, odometerKm, cylinder, side, position, asFoundUm, asLeftUm, shimBeforeUm, shimAfterUm] of rows) {
    const list = by.get(bikeId) ?? [];
    list.push({ odometerKm, date, cylinder, side, position, asFoundMm: asFoundUm / 1000, asLeftMm: mm(asLeftUm), shimBeforeMm: mm(shimBeforeUm), shimAfterMm: mm(shimAfterUm) });
    by.set(bikeId, list);
  }
  return by;
}

/**
 * When each bike's next valve check falls due, in continuous km: from the last valve service and the
 * plan, as the due computation works it out (dueAtKmFor), not from the stored due state, so that the
 * answer changes only with what valve trends are cached against (see DataScope 'valves').
 */
async function nextValveCheckKm(db: DbOrTx, bikeIds: string[], siteIds?: string[]) {
  if (!bikeIds.length) return new Map<string, number | null>();
  const scope = siteIds ? sql`b.site_id in (${sqlList(siteIds)})` : sql`b.id in (${sqlList(bikeIds)})`;
  const rows = await jsonTuples<[string, string, number, OdometerUnit, number | null, number | null, string | null, number | null]>(
    db,
    sql`select json_build_array(b.id, b.in_service_date, b.in_service_odometer, b.odometer_unit, i.every_km, i.first_at_km, l.date, l.odometer_km) as a
          from bikes b join service_items i on i.model_id = b.model_id and i.category = 'valves'
          left join lateral (select d.date, d.odometer_km from service_records d
                              where d.bike_id = b.id and d.service_item_id = i.id
                              order by d.date desc, d.odometer_km desc limit 1) l on true
         where ${scope}`,
  );
  const out = new Map<string, number | null>();
  for (const [bikeId, inServiceDate, inServiceOdometer, unit, everyKm, firstAtKm, lastDate, lastKm] of rows) {
    const lastDone = lastDate === null ? null : { date: lastDate, odometerKm: lastKm! };
    out.set(bikeId, dueAtKmFor({ everyKm, firstAtKm }, lastDone, { date: inServiceDate, odometerKm: toKm(inServiceOdometer, unit) }));
  }
  return out;
}

export interface BikeTrends {
  bikeId: string;
  fleetNumber: string;
  modelId: string;
  modelName: string;
  adjuster: string;
  valves: ValveTrendView[];
}

/** Clearance trends per valve for a set of bikes (one bike's page, a site, the fleet). */
export async function trendsForBikes(db: DbOrTx, where: { bikeIds?: string[]; siteIds?: string[] }): Promise<BikeTrends[]> {
  const cond = where.bikeIds ? inArray(bikes.id, where.bikeIds) : inArray(bikes.siteId, where.siteIds ?? []);
  const list = await db
    .select({ id: bikes.id, fleetNumber: bikes.fleetNumber, model: bikeModels })
    .from(bikes)
    .innerJoin(bikeModels, eq(bikeModels.id, bikes.modelId))
    .where(and(cond, sql`${bikes.status} <> 'retired'`));
  const ids = list.map((b) => b.id);
  // One query after the other: a transaction's single connection cannot run two at once.
  const readings = await readingsForBikes(db, ids, where.bikeIds ? undefined : where.siteIds);
  const nextKm = await nextValveCheckKm(db, ids, where.bikeIds ? undefined : where.siteIds);
  return trendsOf(list, readings, nextKm);
}

/**
 * The same trends for every bike the due scan has just read: the bikes, their plans and last
 * services come from the scan's own inputs, so only the valve readings are read again.
 */
export async function trendsForDueInputs(db: DbOrTx, inputs: DueInputs): Promise<BikeTrends[]> {
  if (!inputs.bikes.length) return [];
  const models = new Map((await db.select().from(bikeModels).where(inArray(bikeModels.id, [...inputs.itemsByModel.keys()]))).map((m) => [m.id, m]));
  const list = inputs.bikes.flatMap((b) => {
    const model = models.get(b.modelId);
    return model ? [{ id: b.id, fleetNumber: b.fleetNumber, model }] : [];
  });
  const readings = await readingsForBikes(db, list.map((b) => b.id), [...new Set(inputs.bikes.map((b) => b.siteId))]);
  const nextKm = new Map<string, number | null>();
  for (const b of inputs.bikes) {
    const item = inputs.itemsByModel.get(b.modelId)?.find((i) => i.category === 'valves');
    if (!item) continue;
    nextKm.set(b.id, dueAtKmFor(item, inputs.lastDone.get(doneKey(b.id, item.id)) ?? null, { date: b.inServiceDate, odometerKm: toKm(b.inServiceOdometer, b.odometerUnit) }));
  }
  return trendsOf(list, readings, nextKm);
}

type TrendBike = { id: string; fleetNumber: string; model: typeof bikeModels.$inferSelect };

function trendsOf(list: TrendBike[], readings: Map<string, StoredValveReading[]>, nextKm: Map<string, number | null>): BikeTrends[] {
  return list.map((b) => {
    const m = toModelSummary(b.model);
    const histories = valveHistories(readings.get(b.id) ?? []);
    const next = nextKm.get(b.id) ?? null;
    return {
      bikeId: b.id,
      fleetNumber: b.fleetNumber,
      modelId: m.id,
      modelName: m.name,
      adjuster: m.adjuster,
      valves: valveLayout(m).map((slot) => {
        const h = histories.get(slot.valveId) ?? [];
        const t = clearanceTrend(h, { specMinMm: slot.specMinMm, nextCheckKm: next });
        return {
          valveId: slot.valveId,
          label: slot.label,
          side: slot.side,
          specMinMm: slot.specMinMm,
          specMaxMm: slot.specMaxMm,
          points: h.map((p) => ({ odometerKm: p.odometerKm, date: p.date, asFoundMm: p.asFoundMm, asLeftMm: p.asLeftMm ?? null })),
          closureMmPer1000Km: t.closureMmPer1000Km,
          kmAtSpecMin: t.kmAtSpecMin,
          nextCheckKm: next,
          tightening: t.tightening,
          warning: t.warning,
        };
      }),
    };
  });
}

