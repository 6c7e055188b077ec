import type { Rng } from '../shared/domain/prng';
import type { ModelRow } from '../server/demo/scenario';
import { round10, serviceValve, type SimulatedReading, type WearingValve } from '../server/demo/valve-wear';

/** Valve clearances that close up with distance (seat wear), read and put back to mid-spec when out of it. */

type Valve = WearingValve;
/** One valve reading as the bulk loader writes it. */
export type ValveReadingCells = SimulatedReading;

const spec = (m: ModelRow, side: 'intake' | 'exhaust'): [number, number] =>
  side === 'intake' ? [m.intakeMinUm, m.intakeMaxUm] : [m.exhaustMinUm, m.exhaustMaxUm];

export function makeValves(m: ModelRow, rng: Rng): Valve[] {
  const valves: Valve[] = [];
  for (let cylinder = 1; cylinder <= m.cylinders; cylinder++) {
    for (const side of ['intake', 'exhaust'] as const) {
      const count = side === 'intake' ? m.intakeValvesPerCylinder : m.exhaustValvesPerCylinder;
      for (let position = 1; position <= count; position++) {
        const [lo, hi] = spec(m, side);
        valves.push({
          cylinder, side, position,
          clearance: lo + (hi - lo) * rng.range(0.5, 0.9),
          closing: side === 'exhaust' ? rng.range(0.2, 2) : rng.range(-0.3, 0.8),
          shim: m.adjuster === 'shim-under-bucket' ? 2400 + 50 * rng.int(0, 10) : null,
        });
      }
    }
  }
  return valves;
}

function nearestShim(m: ModelRow, um: number) {
  const step = m.shimStepUm ?? 50;
  const s = Math.round(um / step) * step;
  return Math.min(m.shimMaxUm ?? 3500, Math.max(m.shimMinUm ?? 1200, s));
}

export function measureValves(m: ModelRow, valves: Valve[], kmSinceLast: number, rng: Rng): ValveReadingCells[] {
  return valves.map((v) => {
    v.clearance -= (v.closing * kmSinceLast) / 1000;
    const asFoundUm = Math.max(0, round10(v.clearance + rng.range(-6, 6)));
    return serviceValve(v, asFoundUm, spec(m, v.side), (um) => nearestShim(m, um));
  });
}
