import type { ClearanceCheck } from './trend';

export type ValveSide = 'intake' | 'exhaust';

export interface EngineLayout {
  cylinders: number;
  intakeValvesPerCylinder: number;
  exhaustValvesPerCylinder: number;
  intakeMinMm: number;
  intakeMaxMm: number;
  exhaustMinMm: number;
  exhaustMaxMm: number;
}

export interface ValveSlot {
  valveId: string;
  cylinder: number;
  side: ValveSide;
  position: number;
  label: string;
  specMinMm: number;
  specMaxMm: number;
}

export const valveId = (cylinder: number, side: ValveSide, position: number) => `c${cylinder}-${side}-${position}`;

export function valveLabel(cylinder: number, side: ValveSide, position: number, layout?: Pick<EngineLayout, 'cylinders' | 'intakeValvesPerCylinder' | 'exhaustValvesPerCylinder'>) {
  const perSide = side === 'intake' ? layout?.intakeValvesPerCylinder : layout?.exhaustValvesPerCylinder;
  const cyl = layout && layout.cylinders === 1 ? '' : `Cylinder ${cylinder} `;
  const pos = perSide === 1 ? '' : ` ${position}`;
  return `${cyl}${side}${pos}`.replace(/^./, (c) => c.toUpperCase());
}

/** One row per valve, in the order a technician works along the head: cylinder, intake then exhaust. */
export function valveLayout(e: EngineLayout): ValveSlot[] {
  const out: ValveSlot[] = [];
  for (let c = 1; c <= e.cylinders; c++) {
    for (const side of ['intake', 'exhaust'] as const) {
      const n = side === 'intake' ? e.intakeValvesPerCylinder : e.exhaustValvesPerCylinder;
      for (let p = 1; p <= n; p++) {
        out.push({
          valveId: valveId(c, side, p),
          cylinder: c,
          side,
          position: p,
          label: valveLabel(c, side, p, e),
          specMinMm: side === 'intake' ? e.intakeMinMm : e.exhaustMinMm,
          specMaxMm: side === 'intake' ? e.intakeMaxMm : e.exhaustMaxMm,
        });
      }
    }
  }
  return out;
}

export interface StoredValveReading {
  odometerKm: number;
  date: string;
  cylinder: number;
  side: ValveSide;
  position: number;
  asFoundMm: number;
  asLeftMm: number | null;
  shimBeforeMm: number | null;
  shimAfterMm: number | null;
}

/** A bike's valve readings grouped per valve, in odometer order, as trend points. */
export function valveHistories(rows: readonly StoredValveReading[]) {
  const by = new Map<string, (ClearanceCheck & { date: string; shimAfterMm: number | null; shimBeforeMm: number | null })[]>();
  for (const r of [...rows].sort((a, b) => a.odometerKm - b.odometerKm)) {
    const id = valveId(r.cylinder, r.side, r.position);
    const list = by.get(id) ?? [];
    list.push({ odometerKm: r.odometerKm, asFoundMm: r.asFoundMm, asLeftMm: r.asLeftMm ?? undefined, date: r.date, shimAfterMm: r.shimAfterMm, shimBeforeMm: r.shimBeforeMm });
    by.set(id, list);
  }
  return by;
}

/** The shim in a valve now: the last one fitted, else the last one read off. */
export function currentShim(history: readonly { shimAfterMm: number | null; shimBeforeMm: number | null }[]) {
  for (let i = history.length - 1; i >= 0; i--) {
    const h = history[i];
    if (h.shimAfterMm != null) return h.shimAfterMm;
    if (h.shimBeforeMm != null) return h.shimBeforeMm;
  }
  return null;
}
