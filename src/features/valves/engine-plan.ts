import { planShims, type ShimPlan, type ValvePlan } from '../../../shared/domain/shim-plan';
import type { ValveCard } from '../../../shared/schemas/valves';
import { planValveOf, type EntryReading } from './card-state';

/** The plan for every valve with an as-found clearance and a shim; an error message if it cannot be made. */
export function engineShimPlan(card: ValveCard, readings: Map<string, EntryReading>): ShimPlan | string | null {
  const valves = card.valves.flatMap((s) => planValveOf(s, readings.get(s.valveId)!) ?? []);
  if (!valves.length || card.adjuster !== 'shim-under-bucket') return null;
  try {
    return planShims({ valves, stock: card.stock.map((s) => ({ sizeMm: s.sizeMm, count: s.count, condition: s.condition })), sizesMm: card.shimSizesMm });
  } catch (e) {
    return (e as Error).message;
  }
}

/** Where a valve's shim comes from, in words. */
export function sourceText(p: ValvePlan, labels: Map<string, string>) {
  if (p.action === 'keep') return 'stays in';
  if (p.action === 'none-fits') return 'order or have ground; the seat may need work';
  if (p.source === 'engine') return `from ${labels.get(p.fromValveId ?? '') ?? 'another valve'}`;
  if (p.source === 'stock') return `shelf, ${p.condition === 'used' ? 'used' : 'new'}`;
  return 'order';
}


/** One valve's part of the engine plan, as its row shows it. */
export interface PlannedShim {
  installMm: number;
  expectedMm: number | null;
  from: string;
}

export function plannedFor(plan: ShimPlan | string | null, valveId: string, labels: Map<string, string>): PlannedShim | undefined {
  if (!plan || typeof plan === 'string') return undefined;
  const p = plan.valves.find((v) => v.valveId === valveId);
  if (!p || p.action !== 'replace' || p.installMm == null) return undefined;
  return { installMm: p.installMm, expectedMm: p.expectedClearanceMm, from: sourceText(p, labels) };
}
