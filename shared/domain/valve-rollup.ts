import { TIGHTENING_THRESHOLD_MM_PER_1000KM } from './trend';

export interface BikeGroupRate {
  modelId: string;
  modelName: string;
  /** e.g. "Cylinder 2 exhaust" */
  position: string;
  /** The bike's closing rate for that position (mean over its valves there), mm per 1,000 km; null without a trend. */
  rateMmPer1000Km: number | null;
  specMinMm: number;
  specMaxMm: number;
  /** Km between scheduled valve checks on this model, if known. */
  intervalKm: number | null;
}

export interface RollupRow {
  modelId: string;
  modelName: string;
  position: string;
  bikes: number;
  tightening: number;
  medianMmPer1000Km: number | null;
  flagged: boolean;
  suggestion: string | null;
}

export function median(xs: readonly number[]): number | null {
  if (!xs.length) return null;
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/**
 * Per model and valve position: how many bikes close up and how fast. A position is flagged when most
 * of at least two bikes tighten and, at the median rate, the valve would use up a quarter of its spec range
 * within one check interval: then the checks should come sooner.
 */
export function rollUp(rates: readonly BikeGroupRate[]): RollupRow[] {
  const groups = new Map<string, BikeGroupRate[]>();
  for (const r of rates) {
    const k = `${r.modelId}|${r.position}`;
    groups.set(k, [...(groups.get(k) ?? []), r]);
  }
  const out: RollupRow[] = [];
  for (const g of groups.values()) {
    const withTrend = g.filter((r) => r.rateMmPer1000Km !== null);
    const tightening = withTrend.filter((r) => r.rateMmPer1000Km! > TIGHTENING_THRESHOLD_MM_PER_1000KM);
    const med = median(withTrend.map((r) => r.rateMmPer1000Km!));
    const { specMinMm, specMaxMm, intervalKm } = g[0];
    // A quarter of the spec range closed within one interval leaves too little margin for the next.
    const quarterRange = (specMaxMm - specMinMm) / 4;
    const closesPerInterval = med !== null && intervalKm ? (med * intervalKm) / 1000 : null;
    const flagged = withTrend.length >= 2 && tightening.length * 2 > withTrend.length && closesPerInterval !== null && closesPerInterval >= quarterRange;
    let suggestion: string | null = null;
    if (flagged && med) {
      const suggested = Math.max(1000, Math.floor(quarterRange / med) * 1000);
      suggestion = `${g[0].position} valves close about ${closesPerInterval!.toFixed(3)} mm per ${intervalKm!.toLocaleString('en-GB')} km interval, more than a quarter of the spec range. Bring the valve checks forward, e.g. every ${suggested.toLocaleString('en-GB')} km, and check the maker’s service manual.`;
    }
    out.push({ modelId: g[0].modelId, modelName: g[0].modelName, position: g[0].position, bikes: withTrend.length, tightening: tightening.length, medianMmPer1000Km: med, flagged, suggestion });
  }
  return out.sort((a, b) => Number(b.flagged) - Number(a.flagged) || a.modelName.localeCompare(b.modelName) || a.position.localeCompare(b.position));
}
