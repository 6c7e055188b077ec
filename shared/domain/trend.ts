import { fromMicrons, toMicrons } from './microns';

export interface Line { slope: number; intercept: number }

function checkPairs(xs: readonly number[], ys: readonly number[]): void {
  if (xs.length !== ys.length) throw new RangeError('xs and ys must have the same length');
}

function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 === 1 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/**
 * Theil–Sen line: slope = median of (yj − yi)/(xj − xi) over pairs with
 * xi ≠ xj (Theil 1950; Sen 1968), intercept = median of y − slope·x. One bad
 * feeler reading moves it little, where least squares is pulled hardest.
 */
export function theilSen(xs: readonly number[], ys: readonly number[]): Line {
  checkPairs(xs, ys);
  const slopes: number[] = [];
  for (let i = 0; i < xs.length; i++) {
    for (let j = i + 1; j < xs.length; j++) {
      if (xs[i] !== xs[j]) slopes.push((ys[j] - ys[i]) / (xs[j] - xs[i]));
    }
  }
  if (slopes.length === 0) throw new RangeError('A line needs at least two distinct x values');
  const slope = median(slopes);
  return { slope, intercept: median(xs.map((x, i) => ys[i] - slope * x)) };
}

/** Ordinary least squares, centred on the means to keep the sums small. */
export function leastSquares(xs: readonly number[], ys: readonly number[]): Line {
  checkPairs(xs, ys);
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (xs[i] - mx) * (ys[i] - my);
    sxx += (xs[i] - mx) ** 2;
  }
  if (!(sxx > 0)) throw new RangeError('A line needs at least two distinct x values');
  const slope = sxy / sxx;
  return { slope, intercept: my - slope * mx };
}

export interface ClearanceCheck {
  odometerKm: number;
  asFoundMm: number;
  /** After adjustment; missing means left as found. */
  asLeftMm?: number | null;
}

export interface TrendOptions { specMinMm: number; nextCheckKm?: number | null }

export interface ClearanceTrend {
  /** Theil–Sen slope of the cumulative closure; positive = tightening. */
  closureMmPer1000Km: number | null;
  /** Closure at odometer 0 on the Theil–Sen line. */
  interceptMm: number | null;
  leastSquaresMmPer1000Km: number | null;
  leastSquaresInterceptMm: number | null;
  kmAtSpecMin: number | null;
  tightening: boolean;
  warning: boolean;
  cumulative: { odometerKm: number; closureMm: number }[];
}

/**
 * Below this rate a valve closes less than one feeler step (0.025 mm) in
 * 50,000 km, longer than any valve interval: the slope is taken as flat.
 */
export const TIGHTENING_THRESHOLD_MM_PER_1000KM = 0.0005;
export const MIN_CHECKS_FOR_TREND = 3;
/** What a feeler-gauge reading can tell apart (common practice: about 0.001 in). */
export const FEELER_RESOLUTION_MM = 0.025;

/**
 * A reshimmed valve keeps wearing, so the trend follows the cumulative closure
 * across adjustments: each step adds (as left at one check − as found at the
 * next), summed in whole micrometres. Checks are taken in odometer order
 * (stable, so two checks at one odometer keep their given order).
 */
export function clearanceTrend(points: readonly ClearanceCheck[], options: TrendOptions): ClearanceTrend {
  const checks = [...points].sort((a, b) => a.odometerKm - b.odometerKm);
  const left = (c: ClearanceCheck) => toMicrons(c.asLeftMm ?? c.asFoundMm);
  let closure = 0;
  const cumulative = checks.map((c, i) => {
    if (i > 0) closure += left(checks[i - 1]) - toMicrons(c.asFoundMm);
    return { odometerKm: c.odometerKm, closureMm: fromMicrons(closure) };
  });
  const none: ClearanceTrend = {
    closureMmPer1000Km: null, interceptMm: null, leastSquaresMmPer1000Km: null, leastSquaresInterceptMm: null,
    kmAtSpecMin: null, tightening: false, warning: false, cumulative,
  };
  const xs = cumulative.map((c) => c.odometerKm / 1000);
  if (checks.length < MIN_CHECKS_FOR_TREND || new Set(xs).size < 2) return none;
  const ys = cumulative.map((c) => c.closureMm);
  const robust = theilSen(xs, ys);
  const ls = leastSquares(xs, ys);
  const rate = robust.slope;
  const tightening = rate > TIGHTENING_THRESHOLD_MM_PER_1000KM;
  const last = checks[checks.length - 1];
  const margin = left(last) - toMicrons(options.specMinMm);
  // Already at or under the minimum counts as reached whatever the trend says.
  const kmAtSpecMin =
    margin <= 0 ? last.odometerKm : tightening ? Math.round(last.odometerKm + (fromMicrons(margin) / rate) * 1000) : null;
  const next = options.nextCheckKm ?? null;
  // A projected crossing only counts when the valve has closed by more than a feeler reading can
  // resolve (about 0.025 mm, common practice); smaller drifts are reading noise. At or under the
  // minimum already always counts.
  const closed = cumulative[cumulative.length - 1].closureMm - cumulative[0].closureMm;
  const meaningful = closed >= FEELER_RESOLUTION_MM || margin <= 0;
  const warning = meaningful && kmAtSpecMin !== null && (kmAtSpecMin <= last.odometerKm || (next !== null && kmAtSpecMin < next));
  return {
    ...none, closureMmPer1000Km: rate, interceptMm: robust.intercept, leastSquaresMmPer1000Km: ls.slope,
    leastSquaresInterceptMm: ls.intercept, kmAtSpecMin, tightening, warning,
  };
}
