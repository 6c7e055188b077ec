/**
 * Whole-micrometre helpers. Clearances and shims are compared and subtracted as
 * integers because in floating point 0.30 − 0.22 is 0.07999999999999999, and a
 * tie between two shim sizes must stay a tie.
 */

export const MICRONS_PER_MM = 1000;
/** 1 in = 25.4 mm exactly (international yard and pound, 1959). */
export const MICRONS_PER_INCH = 25_400;

function assertFinite(value: number, what: string): void {
  if (!Number.isFinite(value)) throw new RangeError(`${what} must be a finite number, got ${value}`);
}

/** Millimetres to the nearest whole micrometre. */
export function toMicrons(mm: number): number {
  assertFinite(mm, 'A length in mm');
  return Math.round(mm * MICRONS_PER_MM);
}

/** Whole (or half) micrometres back to millimetres at the edge of the domain. */
export function fromMicrons(um: number): number {
  return um / MICRONS_PER_MM;
}

/**
 * Inches to the nearest micrometre, halves rounded up (0.0025 in = 63.5 µm → 64).
 * The inch value is first taken in hundred-thousandths of an inch, which is exact
 * for every feeler blade and keeps 63.5 from turning into 63.4999….
 */
export function inchToMicrons(inch: number): number {
  assertFinite(inch, 'A length in inches');
  const hundredThousandths = Math.round(inch * 100_000);
  return Math.round((hundredThousandths * 254) / 1000);
}

export function micronsToInch(um: number): number {
  return um / MICRONS_PER_INCH;
}

/** "0.15" style text from micrometres, without float noise. */
export function formatMicronsAsMm(um: number, decimals = 2): string {
  return fromMicrons(um).toFixed(decimals);
}
