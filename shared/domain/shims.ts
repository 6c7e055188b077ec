import { fromMicrons, toMicrons } from './microns';

export const SHIM_MIN_MM = 1.0;
export const SHIM_MAX_MM = 4.0;

export class ShimInputError extends Error {
  override name = 'ShimInputError';
}

const MARKING_HELP =
  'Enter the shim marking as etched, e.g. "255" for 2.55 mm, or the thickness in mm, e.g. 2.55';

/**
 * A shim's etched marking is its thickness in hundredths of a millimetre, three
 * digits ("255" = 2.55 mm, factory manuals). A plain thickness ("2.55", "2,55",
 * up to three decimals for micrometer readings such as 2.608) is accepted too.
 * Sets that etch only the last two digits are not read: "55" could be 1.55, 2.55
 * or 3.55 mm, so the full marking is asked for instead of guessing.
 */
export function parseShimMarking(marking: string): number {
  const text = marking.trim();
  let um: number;
  if (/^\d{3}$/.test(text)) {
    um = Number(text) * 10;
  } else if (/^\d[.,]\d{1,3}$/.test(text)) {
    um = toMicrons(Number(text.replace(',', '.')));
  } else if (/^\d{1,2}$/.test(text)) {
    throw new ShimInputError(
      `"${text}" is only part of a marking: enter all three digits, e.g. "255" for 2.55 mm, ` +
        'or the thickness in mm, e.g. 2.55',
    );
  } else {
    throw new ShimInputError(MARKING_HELP);
  }
  if (um < toMicrons(SHIM_MIN_MM) || um > toMicrons(SHIM_MAX_MM)) {
    throw new ShimInputError(
      `${fromMicrons(um)} mm is outside the shim range ${SHIM_MIN_MM.toFixed(2)}–` +
        `${SHIM_MAX_MM.toFixed(2)} mm. ${MARKING_HELP}`,
    );
  }
  return fromMicrons(um);
}

export interface ShimSeries {
  minMm: number;
  maxMm: number;
  stepMm: number;
}

/** Every size of a series, min and max included (1.20–3.50 by 0.05 gives 47). */
export function shimSizes({ minMm, maxMm, stepMm }: ShimSeries): number[] {
  const [min, max, step] = [toMicrons(minMm), toMicrons(maxMm), toMicrons(stepMm)];
  if (step <= 0) throw new ShimInputError('The step between shim sizes must be above 0 mm');
  if (min > max) throw new ShimInputError('The smallest shim size must not exceed the largest');
  const sizes: number[] = [];
  for (let um = min; um <= max; um += step) sizes.push(fromMicrons(um));
  return sizes;
}

export interface ShimQuestion {
  currentShimMm: number;
  measuredClearanceMm: number;
  specMinMm: number;
  specMaxMm: number;
  /** Defaults to the middle of the spec. */
  targetMm?: number;
  sizesMm: readonly number[];
}

export type ShimChange = 'keep' | 'replace' | 'none-fits';

export interface ShimRecommendation {
  /** current + measured − target: the size to order or have ground if none fits. */
  exactShimMm: number;
  /** The shim to fit; the current one for 'keep'; null for 'none-fits'. */
  shimMm: number | null;
  expectedClearanceMm: number | null;
  /** Whether the measured clearance is already within spec. */
  inSpec: boolean;
  change: ShimChange;
  /** The ideal size from the series even when the valve is left alone. */
  bestShimMm: number | null;
  bestExpectedClearanceMm: number | null;
  targetMm: number;
}

/** A valve's spec and target in micrometres; the target may be a half micrometre. */
export interface ValveMicrons {
  current: number;
  measured: number;
  min: number;
  max: number;
  target: number;
}

export function valveMicrons(q: Omit<ShimQuestion, 'sizesMm'>): ValveMicrons {
  const v = {
    current: toMicrons(q.currentShimMm),
    measured: toMicrons(q.measuredClearanceMm),
    min: toMicrons(q.specMinMm),
    max: toMicrons(q.specMaxMm),
    target: 0,
  };
  if (v.min > v.max) throw new ShimInputError('The spec minimum must not exceed the maximum');
  if (v.measured < 0) throw new ShimInputError('A measured clearance cannot be below 0 mm');
  v.target = q.targetMm === undefined ? (v.min + v.max) / 2 : toMicrons(q.targetMm);
  if (v.target < v.min || v.target > v.max) {
    throw new ShimInputError('The target clearance must lie within the spec');
  }
  return v;
}

/** Clearance after fitting a shim of `size` µm: a thicker shim closes the gap. */
export function expectedMicrons(v: ValveMicrons, size: number): number {
  return v.measured + v.current - size;
}

export function fitsSpec(v: ValveMicrons, clearance: number): boolean {
  return clearance >= v.min && clearance <= v.max;
}

/**
 * Nearest to target among in-spec sizes; on a tie the thinner shim, because a
 * slightly loose valve only ticks while a tight one burns (common practice).
 */
export function bestSize(v: ValveMicrons, sizes: readonly number[]): number | null {
  let best: number | null = null;
  for (const size of sizes) {
    if (!fitsSpec(v, expectedMicrons(v, size))) continue;
    const d = Math.abs(expectedMicrons(v, size) - v.target);
    const bestD = best === null ? Infinity : Math.abs(expectedMicrons(v, best) - v.target);
    if (d < bestD || (d === bestD && best !== null && size < best)) best = size;
  }
  return best;
}

/**
 * A valve already in spec is not touched (common practice): 'keep' with the
 * current shim, and `bestShimMm` still names the ideal size for the record.
 */
export function recommendShim(q: ShimQuestion): ShimRecommendation {
  const v = valveMicrons(q);
  const best = bestSize(v, q.sizesMm.map(toMicrons));
  const inSpec = fitsSpec(v, v.measured);
  const base = {
    exactShimMm: fromMicrons(v.current + v.measured - v.target),
    inSpec,
    bestShimMm: best === null ? null : fromMicrons(best),
    bestExpectedClearanceMm: best === null ? null : fromMicrons(expectedMicrons(v, best)),
    targetMm: fromMicrons(v.target),
  };
  if (inSpec) {
    return { ...base, change: 'keep', shimMm: fromMicrons(v.current), expectedClearanceMm: fromMicrons(v.measured) };
  }
  if (best === null) return { ...base, change: 'none-fits', shimMm: null, expectedClearanceMm: null };
  return { ...base, change: 'replace', shimMm: base.bestShimMm, expectedClearanceMm: base.bestExpectedClearanceMm };
}
