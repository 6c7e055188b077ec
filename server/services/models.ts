import type { bikeModels } from '../db/schema';
import type { ModelSummary } from '../../shared/schemas/reference';

const mm = (um: number) => um / 1000;
const mmOrNull = (um: number | null) => (um == null ? null : um / 1000);

export function toModelSummary(m: typeof bikeModels.$inferSelect): ModelSummary {
  return {
    id: m.id,
    name: m.name,
    cylinders: m.cylinders,
    intakeValvesPerCylinder: m.intakeValvesPerCylinder,
    exhaustValvesPerCylinder: m.exhaustValvesPerCylinder,
    adjuster: m.adjuster,
    intakeMinMm: mm(m.intakeMinUm),
    intakeMaxMm: mm(m.intakeMaxUm),
    exhaustMinMm: mm(m.exhaustMinUm),
    exhaustMaxMm: mm(m.exhaustMaxUm),
    shimMinMm: mmOrNull(m.shimMinUm),
    shimMaxMm: mmOrNull(m.shimMaxUm),
    shimStepMm: mmOrNull(m.shimStepUm),
  };
}
