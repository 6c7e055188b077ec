import type { ServiceItemUpsert } from '../../../shared/schemas/plans';
import type { PlanItem } from './schemas';
import { num, text } from './form-values';

export interface ReadingRow {
  /** Only for React's list keys: the server gives templates new ids on every save. */
  key: string;
  label: string;
  kind: 'measure' | 'check' | 'date';
  unit: string;
  min: string;
  max: string;
  safetyCritical: boolean;
}

export interface ItemValues {
  name: string;
  category: ServiceItemUpsert['category'];
  everyKm: string;
  everyMonths: string;
  firstAtKm: string;
  rrule: string;
  safetyCritical: boolean;
  estimatedMinutes: string;
  readings: ReadingRow[];
}

let keys = 0;
export const rowKey = () => `row-${++keys}`;

export const BLANK_ITEM: ItemValues = { name: '', category: 'other', everyKm: '', everyMonths: '', firstAtKm: '', rrule: '', safetyCritical: false, estimatedMinutes: '30', readings: [] };

export function itemValues(i: PlanItem): ItemValues {
  return {
    name: i.name,
    category: i.category,
    everyKm: text(i.everyKm),
    everyMonths: text(i.everyMonths),
    firstAtKm: text(i.firstAtKm),
    rrule: i.rrule ?? '',
    safetyCritical: i.safetyCritical,
    estimatedMinutes: String(i.estimatedMinutes),
    readings: i.readings.map((r) => ({ key: rowKey(), label: r.label, kind: r.kind, unit: r.unit ?? '', min: text(r.min), max: text(r.max), safetyCritical: r.safetyCritical })),
  };
}

/** What ServiceItemUpsertSchema reads. Limits and units belong to measurements only. */
export function itemInput(v: ItemValues) {
  return {
    name: v.name,
    category: v.category,
    everyKm: num(v.everyKm),
    everyMonths: num(v.everyMonths),
    firstAtKm: num(v.firstAtKm),
    rrule: v.rrule,
    safetyCritical: v.safetyCritical,
    // Blank is refused (null), not quietly turned into the schema's default.
    estimatedMinutes: num(v.estimatedMinutes),
    readings: v.readings.map((r) => {
      const measure = r.kind === 'measure';
      return { label: r.label, kind: r.kind, unit: measure ? r.unit.trim() || null : null, min: measure ? num(r.min) : null, max: measure ? num(r.max) : null, safetyCritical: r.safetyCritical };
    }),
  };
}
