import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { bikeModels, bikes, dueStates, serviceItems, valveChecks, valveReadings } from '../db/schema';
import { valveHistories, valveLayout, type StoredValveReading } from '../../shared/domain/valves';
import { clearanceTrend } from '../../shared/domain/trend';
import type { ValveTrendView } from '../../shared/schemas/valves';
import { toModelSummary } from './models';

const mm = (um: number | null) => (um == null ? null : um / 1000);

/** Every stored valve reading of the given bikes, in micrometres turned to mm. */
export async function readingsForBikes(db: DbOrTx, bikeIds: string[]) {
  if (!bikeIds.length) return new Map<string, StoredValveReading[]>();
  const rows = await db
    .select({ bikeId: valveChecks.bikeId, date: valveChecks.date, odometerKm: valveChecks.odometerKm, r: valveReadings })
    .from(valveReadings)
    .innerJoin(valveChecks, eq(valveChecks.id, valveReadings.checkId))
    .where(inArray(valveChecks.bikeId, bikeIds))
    .orderBy(asc(valveChecks.odometerKm));
  const by = new Map<string, StoredValveReading[]>();
  for (const { bikeId, date, odometerKm, r } of rows) {
    const list = by.get(bikeId) ?? [];
    list.push({ odometerKm, date, cylinder: r.cylinder, side: r.side, position: r.position, asFoundMm: r.asFoundUm / 1000, asLeftMm: mm(r.asLeftUm), shimBeforeMm: mm(r.shimBeforeUm), shimAfterMm: mm(r.shimAfterUm) });
    by.set(bikeId, list);
  }
  return by;
}

/** When each bike's next valve check falls due, in continuous km (from the stored due state). */
async function nextValveCheckKm(db: DbOrTx, bikeIds: string[]) {
  if (!bikeIds.length) return new Map<string, number | null>();
  const rows = await db
    .select({ bikeId: dueStates.bikeId, dueAtKm: dueStates.dueAtKm })
    .from(dueStates)
    .innerJoin(serviceItems, eq(serviceItems.id, dueStates.serviceItemId))
    .where(and(inArray(dueStates.bikeId, bikeIds), eq(serviceItems.category, 'valves')));
  return new Map(rows.map((r) => [r.bikeId, r.dueAtKm]));
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
  const [readings, nextKm] = await Promise.all([readingsForBikes(db, ids), nextValveCheckKm(db, ids)]);
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

