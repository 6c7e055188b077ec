// Simulated valve wear for invented fleets (the demo scenario and the benchmark's synthetic fleet).

export type Side = 'intake' | 'exhaust';

/** A valve as a simulation follows it: clearance and fitted shim in µm, closing rate in µm per 1000 km. */
export interface WearingValve {
  cylinder: number;
  side: Side;
  position: number;
  clearance: number;
  /** µm per 1000 km; exhaust valves close up faster (common practice). */
  closing: number;
  shim: number | null;
}

export interface SimulatedReading {
  cylinder: number;
  side: Side;
  position: number;
  asFoundUm: number;
  asLeftUm: number | null;
  shimBeforeUm: number | null;
  shimAfterUm: number | null;
}

export const round10 = (um: number) => Math.round(um / 10) * 10;

/**
 * One valve read at a check: left alone inside its band, else brought back to mid-band (a new shim
 * from `nearestShim`, or an adjuster set); the valve's clearance and shim move on with it.
 */
export function serviceValve(v: WearingValve, asFoundUm: number, [lo, hi]: [number, number], nearestShim: (um: number) => number): SimulatedReading {
  const reading: SimulatedReading = { cylinder: v.cylinder, side: v.side, position: v.position, asFoundUm, asLeftUm: null, shimBeforeUm: null, shimAfterUm: null };
  if (asFoundUm >= lo && asFoundUm <= hi) return reading;
  const target = (lo + hi) / 2;
  if (v.shim !== null) {
    // New shim = old shim + measured − target (common practice for shim-under-bucket valves).
    const next = nearestShim(v.shim + asFoundUm - target);
    Object.assign(reading, { shimBeforeUm: v.shim, shimAfterUm: next, asLeftUm: asFoundUm + v.shim - next });
    v.shim = next;
  } else {
    reading.asLeftUm = round10(target);
  }
  v.clearance = reading.asLeftUm!;
  return reading;
}
