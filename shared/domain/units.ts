// Length and distance conversions. Both factors are exact by definition
// (international yard and pound, 1959), so conversions never drift.

export type OdometerUnit = 'km' | 'mi';

export const MM_PER_INCH = 25.4;
export const KM_PER_MILE = 1.609344;

export const ODOMETER_UNITS: readonly OdometerUnit[] = ['km', 'mi'];

export function isOdometerUnit(value: unknown): value is OdometerUnit {
  return value === 'km' || value === 'mi';
}

export function mmToInch(mm: number): number {
  return mm / MM_PER_INCH;
}

export function inchToMm(inch: number): number {
  return inch * MM_PER_INCH;
}

export function kmToMiles(km: number): number {
  return km / KM_PER_MILE;
}

export function milesToKm(miles: number): number {
  return miles * KM_PER_MILE;
}

export function toKm(value: number, unit: OdometerUnit): number {
  return unit === 'km' ? value : milesToKm(value);
}

export function fromKm(km: number, unit: OdometerUnit): number {
  return unit === 'km' ? km : kmToMiles(km);
}

/**
 * Rounds half away from zero at `decimals` places, as a person rounding the
 * written decimal would. Plain Math.round(x * 1000) / 1000 gets this wrong
 * for products such as 0.0075 * 25.4 (exactly 0.1905), which floating point
 * holds as 0.19049999…: the value is first trimmed to 12 significant digits
 * to drop that noise, then shifted by decimal exponent, not by multiplying.
 */
export function roundTo(value: number, decimals: number): number {
  if (!Number.isFinite(value)) return value;
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > 12) {
    throw new Error(`roundTo needs 0 to 12 decimal places, got ${decimals}`);
  }
  const clean = Math.abs(Number(value.toPrecision(12)));
  const text = String(clean);
  const shifted = text.includes('e') ? clean * 10 ** decimals : Number(`${text}e${decimals}`);
  const rounded = Number(`${Math.round(shifted)}e-${decimals}`);
  return value < 0 && rounded !== 0 ? -rounded : rounded;
}

/** Inches to millimetres rounded to 0.001 mm, the way feeler blades are labelled. */
export function inchToMmRounded(inch: number, decimals = 3): number {
  return roundTo(inchToMm(inch), decimals);
}

/** Clearance and shim arithmetic runs in whole micrometres to avoid float drift. */
export function mmToMicrometres(mm: number): number {
  return roundTo(mm * 1000, 0);
}

export function micrometresToMm(um: number): number {
  return um / 1000;
}
