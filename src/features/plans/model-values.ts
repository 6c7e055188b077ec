import type { ModelUpsert } from '../../../shared/schemas/plans';
import type { ModelSummary } from '../../../shared/schemas/reference';
import { mm, num, text } from './form-values';

// Shown as the trade writes them (0.10, 1.20), not as the number prints (0.1, 1.2).
const mmText = (v: number | null) => (v == null ? text(v) : mm(v));

/** The model form as typed: text, so nothing is lost or reformatted while it is being corrected. */
export interface ModelValues {
  name: string;
  cylinders: string;
  intakeValvesPerCylinder: string;
  exhaustValvesPerCylinder: string;
  adjuster: ModelSummary['adjuster'];
  intakeMinMm: string;
  intakeMaxMm: string;
  exhaustMinMm: string;
  exhaustMaxMm: string;
  shimMinMm: string;
  shimMaxMm: string;
  shimStepMm: string;
}

export const BLANK_MODEL: ModelValues = {
  name: '',
  cylinders: '1',
  intakeValvesPerCylinder: '1',
  exhaustValvesPerCylinder: '1',
  adjuster: 'screw-and-locknut',
  intakeMinMm: '',
  intakeMaxMm: '',
  exhaustMinMm: '',
  exhaustMaxMm: '',
  shimMinMm: '',
  shimMaxMm: '',
  shimStepMm: '',
};

export function modelValues(m: ModelSummary): ModelValues {
  return {
    name: m.name,
    cylinders: String(m.cylinders),
    intakeValvesPerCylinder: String(m.intakeValvesPerCylinder),
    exhaustValvesPerCylinder: String(m.exhaustValvesPerCylinder),
    adjuster: m.adjuster,
    intakeMinMm: mmText(m.intakeMinMm),
    intakeMaxMm: mmText(m.intakeMaxMm),
    exhaustMinMm: mmText(m.exhaustMinMm),
    exhaustMaxMm: mmText(m.exhaustMaxMm),
    shimMinMm: mmText(m.shimMinMm),
    shimMaxMm: mmText(m.shimMaxMm),
    shimStepMm: mmText(m.shimStepMm),
  };
}

/** What ModelUpsertSchema reads; blanks become undefined so the schema names the missing field. */
export function modelInput(v: ModelValues): Record<keyof ModelUpsert, unknown> {
  const req = (s: string) => num(s) ?? undefined;
  const shim = v.adjuster === 'shim-under-bucket';
  return {
    name: v.name,
    cylinders: Number(v.cylinders),
    intakeValvesPerCylinder: Number(v.intakeValvesPerCylinder),
    exhaustValvesPerCylinder: Number(v.exhaustValvesPerCylinder),
    adjuster: v.adjuster,
    intakeMinMm: req(v.intakeMinMm),
    intakeMaxMm: req(v.intakeMaxMm),
    exhaustMinMm: req(v.exhaustMinMm),
    exhaustMaxMm: req(v.exhaustMaxMm),
    // A screw-adjusted engine has no shims: whatever was typed stays on screen but is not sent.
    shimMinMm: shim ? num(v.shimMinMm) : null,
    shimMaxMm: shim ? num(v.shimMaxMm) : null,
    shimStepMm: shim ? num(v.shimStepMm) : null,
  };
}
