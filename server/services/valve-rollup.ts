import { and, eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { serviceItems } from '../db/schema';
import { rollUp, type BikeGroupRate } from '../../shared/domain/valve-rollup';
import { trendsForBikes } from './valve-history';

const positionOf = (label: string) => label.replace(/ \d+$/, '');

export async function fleetRollup(db: DbOrTx, siteIds: string[]) {
  const trends = await trendsForBikes(db, { siteIds });
  const modelIds = [...new Set(trends.map((t) => t.modelId))];
  const intervals = modelIds.length
    ? await db.select({ modelId: serviceItems.modelId, everyKm: serviceItems.everyKm }).from(serviceItems).where(and(inArray(serviceItems.modelId, modelIds), eq(serviceItems.category, 'valves')))
    : [];
  const intervalBy = new Map(intervals.map((i) => [i.modelId, i.everyKm]));
  const rates: BikeGroupRate[] = [];
  for (const b of trends) {
    const groups = new Map<string, typeof b.valves>();
    for (const v of b.valves) groups.set(positionOf(v.label), [...(groups.get(positionOf(v.label)) ?? []), v]);
    for (const [position, valves] of groups) {
      const known = valves.filter((v) => v.closureMmPer1000Km !== null);
      rates.push({
        modelId: b.modelId,
        modelName: b.modelName,
        position,
        rateMmPer1000Km: known.length ? known.reduce((s, v) => s + v.closureMmPer1000Km!, 0) / known.length : null,
        specMinMm: valves[0].specMinMm,
        specMaxMm: valves[0].specMaxMm,
        intervalKm: intervalBy.get(b.modelId) ?? null,
      });
    }
  }
  return rollUp(rates);
}
