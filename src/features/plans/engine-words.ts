import type { ModelSummary } from '../../../shared/schemas/reference';
import { mm } from './form-values';

export const ADJUSTER_LABELS: Record<ModelSummary['adjuster'], string> = {
  'shim-under-bucket': 'Shim under bucket',
  'screw-and-locknut': 'Screw and locknut',
};

const LAYOUT = ['', 'Single', 'Twin', 'Triple', 'Four'];
export const layoutName = (cylinders: number) => LAYOUT[cylinders] ?? `${cylinders} cylinders`;

/** "Twin · 8 valves (2 intake, 2 exhaust per cylinder)". */
export function engineWords(m: Pick<ModelSummary, 'cylinders' | 'intakeValvesPerCylinder' | 'exhaustValvesPerCylinder'>) {
  const total = m.cylinders * (m.intakeValvesPerCylinder + m.exhaustValvesPerCylinder);
  return `${layoutName(m.cylinders)} · ${total} valves (${m.intakeValvesPerCylinder} intake, ${m.exhaustValvesPerCylinder} exhaust per cylinder)`;
}

/** How many shim sizes a range holds, counted in whole micrometres; null when it does not go in whole steps. */
export function shimSizeCount(min: number | null, max: number | null, step: number | null) {
  if (min == null || max == null || step == null || [min, max, step].some(Number.isNaN)) return null;
  const [lo, hi, st] = [min, max, step].map((v) => Math.round(v * 1000));
  if (st <= 0 || hi <= lo || (hi - lo) % st !== 0) return null;
  return (hi - lo) / st + 1;
}

export function adjusterWords(m: ModelSummary) {
  if (m.adjuster !== 'shim-under-bucket') return ADJUSTER_LABELS[m.adjuster];
  const n = shimSizeCount(m.shimMinMm, m.shimMaxMm, m.shimStepMm);
  return `${ADJUSTER_LABELS[m.adjuster]}, ${mm(m.shimMinMm)}–${mm(m.shimMaxMm)} mm by ${mm(m.shimStepMm)} mm${n ? ` (${n} sizes)` : ''}`;
}
