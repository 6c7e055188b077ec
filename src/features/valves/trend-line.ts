import type { ValveTrendView } from '../../../shared/schemas/valves';

export interface Projection {
  fromKm: number;
  fromMm: number;
  toKm: number;
  toMm: number;
}

/**
 * The trend drawn forward from the last check: through the clearance the valve was left
 * with, falling at the fitted closure rate, up to the next scheduled check.
 */
export function projection(v: ValveTrendView): Projection | null {
  const last = v.points.at(-1);
  if (!last || v.closureMmPer1000Km == null || v.nextCheckKm == null || v.nextCheckKm <= last.odometerKm) return null;
  const fromMm = last.asLeftMm ?? last.asFoundMm;
  const toMm = fromMm - (v.closureMmPer1000Km * (v.nextCheckKm - last.odometerKm)) / 1000;
  return { fromKm: last.odometerKm, fromMm, toKm: v.nextCheckKm, toMm: Math.max(0, toMm) };
}
