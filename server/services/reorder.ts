import { and, eq, inArray, isNotNull } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { bikeModels, bikes, serviceItems, serviceTasks } from '../db/schema';
import { planShims, type PlanValve } from '../../shared/domain/shim-plan';
import { shimSizes } from '../../shared/domain/shims';
import { clearanceFromFeelers } from '../../shared/domain/feeler';
import { valveLayout } from '../../shared/domain/valves';
import { toModelSummary } from './models';
import { stockAt } from './shim-stock';

interface DraftReading {
  valveId?: unknown;
  asFound?: { method?: unknown; slidesMm?: unknown; stopsMm?: unknown; mm?: unknown };
  shimBeforeMm?: unknown;
}

const num = (v: unknown) => (typeof v === 'number' && Number.isFinite(v) ? v : null);

function measured(r: DraftReading): number | null {
  if (r.asFound?.method === 'direct') return num(r.asFound.mm);
  if (r.asFound?.method === 'feeler') {
    try {
      return clearanceFromFeelers({ slidesMm: num(r.asFound.slidesMm), stopsMm: num(r.asFound.stopsMm) }).estimateMm;
    } catch {
      return null;
    }
  }
  return null;
}

export interface ReorderLine {
  sizeMm: number;
  need: number;
  reasons: string[];
}

/** What to order for a site: shims the open valve cards will need beyond stock, and sizes below their minimum. */
export async function reorderList(db: DbOrTx, siteId: string): Promise<ReorderLine[]> {
  const stock = await stockAt(db, siteId);
  const lines = new Map<number, ReorderLine>();
  const add = (sizeMm: number, need: number, reason: string) => {
    const l = lines.get(sizeMm) ?? { sizeMm, need: 0, reasons: [] };
    l.need += need;
    l.reasons.push(reason);
    lines.set(sizeMm, l);
  };
  const open = await db
    .select({ draft: serviceTasks.draft, fleetNumber: bikes.fleetNumber, model: bikeModels })
    .from(serviceTasks)
    .innerJoin(bikes, eq(bikes.id, serviceTasks.bikeId))
    .innerJoin(bikeModels, eq(bikeModels.id, bikes.modelId))
    .innerJoin(serviceItems, eq(serviceItems.id, serviceTasks.serviceItemId))
    .where(and(eq(bikes.siteId, siteId), eq(serviceItems.category, 'valves'), inArray(serviceTasks.status, ['open', 'in_progress']), isNotNull(serviceTasks.draft)));
  for (const o of open) {
    const m = toModelSummary(o.model);
    if (m.adjuster !== 'shim-under-bucket' || !m.shimMinMm || !m.shimMaxMm || !m.shimStepMm) continue;
    const readings = ((o.draft as { readings?: DraftReading[] })?.readings ?? []).filter(Boolean);
    const byId = new Map(readings.map((r) => [String(r.valveId), r]));
    const valves: PlanValve[] = [];
    for (const slot of valveLayout(m)) {
      const r = byId.get(slot.valveId);
      const clearance = r ? measured(r) : null;
      const shim = r ? num(r.shimBeforeMm) : null;
      if (clearance === null || shim === null) continue;
      valves.push({ valveId: slot.valveId, currentShimMm: shim, measuredClearanceMm: clearance, specMinMm: slot.specMinMm, specMaxMm: slot.specMaxMm });
    }
    if (!valves.length) continue;
    const plan = planShims({ valves, stock: stock.map((s) => ({ sizeMm: s.sizeMm, count: s.count, condition: s.condition })), sizesMm: shimSizes({ minMm: m.shimMinMm, maxMm: m.shimMaxMm, stepMm: m.shimStepMm }) });
    for (const o2 of plan.order) add(o2.sizeMm, o2.count, `${o.fleetNumber} valve card`);
  }
  const bySize = new Map<number, { count: number; min: number }>();
  for (const s of stock) {
    const e = bySize.get(s.sizeMm) ?? { count: 0, min: 0 };
    e.count += s.count;
    e.min = Math.max(e.min, s.minCount);
    bySize.set(s.sizeMm, e);
  }
  for (const [size, e] of bySize) if (e.count < e.min) add(size, e.min - e.count, `below the minimum of ${e.min}`);
  return [...lines.values()].sort((a, b) => a.sizeMm - b.sizeMm);
}
