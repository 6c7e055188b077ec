import { shimSizes } from '../../../shared/domain/shims';
import { fromMicrons, toMicrons } from '../../../shared/domain/microns';
import type { ModelSummary } from '../../../shared/schemas/reference';
import type { ShimStockLine } from '../../../shared/schemas/valves';

export interface SizeRow {
  sizeMm: number;
  newCount: number;
  usedCount: number;
  minCount: number;
  /** How many short of the minimum, new and used together (as the reorder list counts). */
  short: number;
}

/** Every size the fleet's engines can take, plus any size on the shelf, one row each. */
export function stockRows(lines: readonly ShimStockLine[], models: readonly ModelSummary[]): SizeRow[] {
  const by = new Map<number, SizeRow>();
  const row = (um: number) => {
    const r = by.get(um) ?? { sizeMm: fromMicrons(um), newCount: 0, usedCount: 0, minCount: 0, short: 0 };
    by.set(um, r);
    return r;
  };
  for (const m of models) {
    if (m.adjuster !== 'shim-under-bucket' || !m.shimMinMm || !m.shimMaxMm || !m.shimStepMm) continue;
    for (const mm of shimSizes({ minMm: m.shimMinMm, maxMm: m.shimMaxMm, stepMm: m.shimStepMm })) row(toMicrons(mm));
  }
  for (const l of lines) {
    const r = row(toMicrons(l.sizeMm));
    if (l.condition === 'new') r.newCount += l.count;
    else r.usedCount += l.count;
    r.minCount = Math.max(r.minCount, l.minCount);
  }
  for (const r of by.values()) r.short = Math.max(0, r.minCount - r.newCount - r.usedCount);
  return [...by.values()].sort((a, b) => a.sizeMm - b.sizeMm);
}

export const fmtSize = (mm: number) => {
  const s = fromMicrons(toMicrons(mm)).toFixed(3);
  return `${s.endsWith('0') ? s.slice(0, -1) : s} mm`;
};
