import munkres from 'munkres';
import { fromMicrons, toMicrons } from './microns';
import {
  bestSize, expectedMicrons, fitsSpec, ShimInputError, valveMicrons, type ValveMicrons,
} from './shims';

export interface PlanValve {
  valveId: string;
  currentShimMm: number;
  measuredClearanceMm: number;
  specMinMm: number;
  specMaxMm: number;
  targetMm?: number;
}
export type ShimCondition = 'new' | 'used';
export interface StockLine { sizeMm: number; count: number; condition?: ShimCondition }
export interface ShimPlanInput {
  valves: readonly PlanValve[];
  stock: readonly StockLine[];
  /** The sizes that can be ordered. */
  sizesMm: readonly number[];
}
export type ShimSource = 'engine' | 'stock' | 'order';
export interface ValvePlan {
  valveId: string;
  action: 'keep' | 'replace' | 'none-fits';
  installMm: number | null;
  source: ShimSource | null;
  fromValveId?: string;
  condition?: ShimCondition;
  expectedClearanceMm: number | null;
  /** The shim that comes out of this valve, null when it stays in. */
  removedShimMm: number | null;
}
export interface SizeCount { sizeMm: number; count: number; condition?: ShimCondition }
export interface ShimPlan {
  valves: ValvePlan[];
  order: SizeCount[];
  stockUsed: SizeCount[];
  /** Shims taken out of this engine and not refitted. */
  returnedToStock: SizeCount[];
}

interface Supply { source: ShimSource; size: number; fromValveId?: string; condition?: ShimCondition }
interface Row { valveId: string; v: ValveMicrons }
interface Prepared { rows: Row[]; plans: Map<string, ValvePlan>; engine: Supply[]; stock: Supply[]; series: number[] }

/**
 * In-spec valves stay as they are. An out-of-spec valve for which no size of
 * the series fits needs seat work, not a shim (factory manual guidance): its
 * shim stays in and is not offered to the other valves. Every other valve gets
 * a shim, and its old one joins the engine's pool.
 */
function prepare(input: ShimPlanInput): Prepared {
  const series = [...new Set(input.sizesMm.map(toMicrons))].sort((a, b) => a - b);
  const plans = new Map<string, ValvePlan>();
  const rows: Row[] = [];
  for (const valve of input.valves) {
    if (plans.has(valve.valveId)) throw new ShimInputError(`Valve ${valve.valveId} is listed twice`);
    const v = valveMicrons(valve);
    const base = { valveId: valve.valveId, source: null, removedShimMm: null };
    if (fitsSpec(v, v.measured)) {
      plans.set(valve.valveId, { ...base, action: 'keep', installMm: fromMicrons(v.current), expectedClearanceMm: fromMicrons(v.measured) });
    } else if (bestSize(v, series) === null) {
      plans.set(valve.valveId, { ...base, action: 'none-fits', installMm: null, expectedClearanceMm: null });
    } else {
      plans.set(valve.valveId, { ...base, action: 'replace', installMm: null, expectedClearanceMm: null });
      rows.push({ valveId: valve.valveId, v });
    }
  }
  const engine = rows.map((r): Supply => ({ source: 'engine', size: r.v.current, fromValveId: r.valveId }));
  const stock = input.stock.flatMap((line): Supply[] => {
    if (!Number.isInteger(line.count) || line.count < 0) {
      throw new ShimInputError('A stock count must be a whole number of 0 or more');
    }
    // More units of one line than valves to reshim can never be used; capping keeps the matrix small.
    return Array.from({ length: Math.min(line.count, rows.length) }, () => ({ source: 'stock', size: toMicrons(line.sizeMm), condition: line.condition }));
  });
  return { rows, plans, engine, stock, series };
}

/** Distance from target in half micrometres (targets may sit on a half). */
function halfDistance(v: ValveMicrons, size: number): number {
  return Math.abs(2 * expectedMicrons(v, size) - 2 * v.target);
}

function finish(p: Prepared, chosen: (Supply | undefined)[]): ShimPlan {
  const used = new Set<Supply>();
  p.rows.forEach((row, i) => {
    const s = chosen[i];
    if (!s) throw new Error(`No shim chosen for valve ${row.valveId}`);
    used.add(s);
    const plan = p.plans.get(row.valveId)!;
    Object.assign(plan, {
      installMm: fromMicrons(s.size), source: s.source, expectedClearanceMm: fromMicrons(expectedMicrons(row.v, s.size)),
      removedShimMm: fromMicrons(row.v.current),
      ...(s.fromValveId ? { fromValveId: s.fromValveId } : {}), ...(s.condition ? { condition: s.condition } : {}),
    });
  });
  const tally = (list: Supply[]): SizeCount[] => {
    const counts = new Map<string, SizeCount>();
    for (const s of list) {
      const key = `${s.size}/${s.condition ?? ''}`;
      const entry = counts.get(key) ?? { sizeMm: fromMicrons(s.size), count: 0, ...(s.condition ? { condition: s.condition } : {}) };
      entry.count += 1;
      counts.set(key, entry);
    }
    return [...counts.values()].sort((a, b) => a.sizeMm - b.sizeMm || (a.condition ?? '').localeCompare(b.condition ?? ''));
  };
  const picked = chosen.filter((s): s is Supply => s !== undefined);
  return {
    valves: [...p.plans.values()],
    order: tally(picked.filter((s) => s.source === 'order')),
    stockUsed: tally(picked.filter((s) => s.source === 'stock')),
    returnedToStock: tally(p.engine.filter((s) => !used.has(s))),
  };
}

/**
 * Shims for a whole engine as an assignment problem (Hungarian method): one row
 * per valve to reshim, one column per shim that could go in (each removed
 * shim, each stock unit, and one "order" column per row for every size). The
 * cost ranks, strictly in this order: shims bought, stock used, distance from
 * target, the tight side of a tie, and used stock before new (new shims are
 * worth keeping on the shelf; a used one has already proved its thickness).
 */
export function planShims(input: ShimPlanInput): ShimPlan {
  const p = prepare(input);
  const n = p.rows.length;
  if (n === 0) return finish(p, []);
  const orderCols = p.series.flatMap((size) => Array.from({ length: n }, (): Supply => ({ source: 'order', size })));
  const cols = [...p.engine, ...p.stock, ...orderCols];
  const maxDist = Math.max(0, ...p.rows.map((r) => 2 * (r.v.max - r.v.min)));
  const wTight = n + 1;
  const wDist = wTight * (n + 1);
  const wStock = wDist * (n * maxDist + 1);
  const wOrder = wStock * (n + 1);
  const cost = p.rows.map((row) => cols.map((s) => {
    const e = expectedMicrons(row.v, s.size);
    if (!fitsSpec(row.v, e) || s.fromValveId === row.valveId) return Infinity;
    const sourceCost = s.source === 'order' ? wOrder : s.source === 'stock' ? wStock : 0;
    return sourceCost + wDist * halfDistance(row.v, s.size) + (e < row.v.target ? wTight : 0) + (s.condition === 'new' ? 1 : 0);
  }));
  const chosen: (Supply | undefined)[] = new Array(n);
  for (const [r, c] of munkres(cost)) {
    if (cost[r][c] === Infinity) throw new Error('No in-spec shim left for a valve that has one in the series');
    chosen[r] = cols[c];
  }
  return finish(p, chosen);
}

/**
 * The plan a technician makes valve by valve: nearest in-spec size of the
 * series, taken from the removed shims if one matches, else from stock (used
 * before new), else ordered. Kept to show what the assignment saves.
 */
export function greedyShimPlan(input: ShimPlanInput): ShimPlan {
  const p = prepare(input);
  const free = new Set<Supply>([...p.engine, ...p.stock.filter((s) => s.condition !== 'new'), ...p.stock.filter((s) => s.condition === 'new')]);
  const chosen = p.rows.map((row) => {
    const size = bestSize(row.v, p.series)!;
    const found = [...free].find((s) => s.size === size && s.fromValveId !== row.valveId);
    if (found) free.delete(found);
    return found ?? { source: 'order' as const, size };
  });
  return finish(p, chosen);
}
