import type { readingTemplates, serviceItems } from '../db/schema';
import { DEFAULT_LIMITS } from '../../shared/domain/limits';

type Item = typeof serviceItems.$inferInsert;
type Template = Omit<typeof readingTemplates.$inferInsert, 'serviceItemId'>;

/** What each kind of service asks the technician to record, with the default limits. */
const BY_CATEGORY: Partial<Record<Item['category'], Template[]>> = {
  oil: [
    { label: 'Oil and filter changed', kind: 'check' },
    { label: 'Oil added', kind: 'measure', unit: 'L', min: 0.5, max: 5 },
  ],
  chain: [{ label: 'Chain slack', kind: 'measure', unit: 'mm', min: DEFAULT_LIMITS.chainSlackMm.min, max: DEFAULT_LIMITS.chainSlackMm.max }],
  brakes: [
    { label: 'Front tyre tread', kind: 'measure', unit: 'mm', min: DEFAULT_LIMITS.tyreTreadMinMm, safetyCritical: true },
    { label: 'Rear tyre tread', kind: 'measure', unit: 'mm', min: DEFAULT_LIMITS.tyreTreadMinMm, safetyCritical: true },
    { label: 'Front brake pads', kind: 'measure', unit: 'mm', min: DEFAULT_LIMITS.brakePadMinMm, safetyCritical: true },
    { label: 'Rear brake pads', kind: 'measure', unit: 'mm', min: DEFAULT_LIMITS.brakePadMinMm, safetyCritical: true },
  ],
  'brake-fluid': [
    { label: 'Brake fluid renewed', kind: 'check', safetyCritical: true },
    { label: 'Date of the fluid', kind: 'date' },
  ],
  inspection: [
    { label: 'Lights, horn and indicators work', kind: 'check', safetyCritical: true },
    { label: 'Spark plug gap', kind: 'measure', unit: 'mm', min: DEFAULT_LIMITS.sparkPlugGapMm.min, max: DEFAULT_LIMITS.sparkPlugGapMm.max },
    { label: 'Battery voltage (rested)', kind: 'measure', unit: 'V', min: DEFAULT_LIMITS.batteryMinV },
  ],
};

export function demoReadingTemplates(items: (Item & { id?: string })[]) {
  return items.flatMap((it) => (BY_CATEGORY[it.category] ?? []).map((t, position) => ({ ...t, serviceItemId: it.id!, position })));
}
