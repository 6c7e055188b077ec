import { formatMicronsAsMm, fromMicrons, inchToMicrons, toMicrons } from './microns';

/**
 * A usual metric feeler set: 0.02–0.10 mm by 0.01, then 0.15–1.00 mm by 0.05
 * (common practice). Built from micrometres so every value is the clean decimal.
 */
export const METRIC_BLADES_MM: readonly number[] = Object.freeze([
  ...Array.from({ length: 9 }, (_, i) => fromMicrons(20 + 10 * i)),
  ...Array.from({ length: 18 }, (_, i) => fromMicrons(150 + 50 * i)),
]);

/** A usual inch feeler set, in inches (common practice). */
export const INCH_BLADES_IN: readonly number[] = Object.freeze([
  0.0015, 0.002, 0.0025, 0.003, 0.004, 0.005, 0.006, 0.007, 0.008, 0.009, 0.01, 0.011, 0.012,
  0.013, 0.014, 0.015, 0.016, 0.018, 0.02, 0.022, 0.025, 0.028, 0.03,
]);

export type BladeKind = 'metric' | 'inch';

export interface Blade {
  label: string;
  /** Thickness in mm, to 0.001 mm for inch blades (0.0025 in → 0.064). */
  mm: number;
  /** Nominal thickness in inches, inch blades only. */
  inch?: number;
}

function inchLabel(inch: number): string {
  // Three decimals as stamped on the blade, a fourth only for half-thou blades.
  const tenThousandths = Math.round(inch * 10_000);
  return `${inch.toFixed(tenThousandths % 10 === 0 ? 3 : 4)} in`;
}

export function bladeSeries(kind: BladeKind): Blade[] {
  if (kind === 'metric') {
    return METRIC_BLADES_MM.map((mm) => ({ label: `${formatMicronsAsMm(toMicrons(mm))} mm`, mm }));
  }
  return INCH_BLADES_IN.map((inch) => ({
    label: inchLabel(inch),
    mm: fromMicrons(inchToMicrons(inch)),
    inch,
  }));
}

/**
 * The blade to try after the one that slid in: the thinnest blade thicker than
 * `slidesMm`, or the thinnest blade of all when nothing slid in. Null past the
 * thickest blade.
 */
export function nextBladeUp(
  series: readonly Blade[] | readonly number[],
  slidesMm: number | null,
): number | null {
  const floor = slidesMm === null ? -1 : toMicrons(slidesMm);
  const thicker = series
    .map((b) => toMicrons(typeof b === 'number' ? b : b.mm))
    .filter((um) => um > floor)
    .sort((a, b) => a - b);
  return thicker.length > 0 ? fromMicrons(thicker[0]) : null;
}

export class FeelerReadingError extends Error {
  override name = 'FeelerReadingError';
}

export interface FeelerReading {
  /** Thickest blade that slides in with a light drag; null when none enters. */
  slidesMm: number | null;
  /** Next blade up, which does not enter; null when not tried. */
  stopsMm: number | null;
}

export interface ClearanceRange {
  minMm: number;
  /** Exclusive upper bound; null when no blade was found that stops. */
  maxMm: number | null;
  estimateMm: number;
}

function bladeMicrons(mm: number, which: string): number {
  if (!Number.isFinite(mm) || mm <= 0) {
    throw new FeelerReadingError(`The ${which} blade must be a thickness above 0 mm, got ${mm}`);
  }
  return toMicrons(mm);
}

/**
 * The clearance is read as the blade that slides (common practice), so the
 * true gap lies in [slides, stops). With no blade entering, the estimate is 0:
 * reading it tight leads to a thinner shim, and a loose valve is the safe error.
 */
export function clearanceFromFeelers({ slidesMm, stopsMm }: FeelerReading): ClearanceRange {
  if (slidesMm === null && stopsMm === null) {
    throw new FeelerReadingError(
      'Enter the thickest blade that slides in, or the thinnest blade that will not go in',
    );
  }
  const slides = slidesMm === null ? 0 : bladeMicrons(slidesMm, 'sliding');
  const stops = stopsMm === null ? null : bladeMicrons(stopsMm, 'stopping');
  if (stops !== null && slides >= stops) {
    throw new FeelerReadingError(
      `The blade that slides in (${fromMicrons(slides)} mm) must be thinner than the blade ` +
        `that will not go in (${fromMicrons(stops)} mm); check the two readings`,
    );
  }
  return {
    minMm: fromMicrons(slides),
    maxMm: stops === null ? null : fromMicrons(stops),
    estimateMm: fromMicrons(slides),
  };
}
