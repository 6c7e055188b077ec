import { z } from 'zod';
import { IdSchema } from './common';
import { validateRule } from '../domain/due';

export const SERVICE_CATEGORIES = ['oil', 'valves', 'chain', 'brakes', 'tyres', 'brake-fluid', 'inspection', 'other'] as const;
export const CATEGORY_LABELS: Record<(typeof SERVICE_CATEGORIES)[number], string> = {
  oil: 'Oil and filter',
  valves: 'Valve clearance',
  chain: 'Chain',
  brakes: 'Brakes',
  tyres: 'Tyres',
  'brake-fluid': 'Brake fluid',
  inspection: 'Inspection',
  other: 'Other',
};

const um = (mm: number) => Math.round(mm * 1000);
const Clearance = z.number().min(0.01, 'A clearance is at least 0.01 mm.').max(2, 'A clearance above 2 mm is not a valve clearance: check the unit (mm).');

export const ModelUpsertSchema = z
  .object({
    name: z.string().trim().min(1, 'Name the model.').max(80),
    cylinders: z.number().int().min(1).max(8),
    intakeValvesPerCylinder: z.number().int().min(1).max(3),
    exhaustValvesPerCylinder: z.number().int().min(1).max(3),
    adjuster: z.enum(['shim-under-bucket', 'screw-and-locknut']),
    intakeMinMm: Clearance,
    intakeMaxMm: Clearance,
    exhaustMinMm: Clearance,
    exhaustMaxMm: Clearance,
    shimMinMm: z.number().min(1).max(4).nullable().optional(),
    shimMaxMm: z.number().min(1).max(4).nullable().optional(),
    shimStepMm: z.number().min(0.005).max(0.5).nullable().optional(),
  })
  .superRefine((m, ctx) => {
    if (um(m.intakeMinMm) >= um(m.intakeMaxMm)) ctx.addIssue({ code: 'custom', path: ['intakeMaxMm'], message: 'The intake maximum must be above its minimum.' });
    if (um(m.exhaustMinMm) >= um(m.exhaustMaxMm)) ctx.addIssue({ code: 'custom', path: ['exhaustMaxMm'], message: 'The exhaust maximum must be above its minimum.' });
    if (m.adjuster !== 'shim-under-bucket') return;
    const { shimMinMm: lo, shimMaxMm: hi, shimStepMm: step } = m;
    if (lo == null || hi == null || step == null) {
      ctx.addIssue({ code: 'custom', path: ['shimStepMm'], message: 'A shim-under-bucket engine needs its shim range and step, e.g. 1.20–3.50 mm by 0.05 mm.' });
      return;
    }
    if (um(lo) >= um(hi)) ctx.addIssue({ code: 'custom', path: ['shimMaxMm'], message: 'The largest shim must be thicker than the smallest.' });
    else if ((um(hi) - um(lo)) % um(step) !== 0)
      ctx.addIssue({ code: 'custom', path: ['shimStepMm'], message: `From ${lo.toFixed(2)} to ${hi.toFixed(2)} mm does not go in whole steps of ${step} mm.` });
  });
export type ModelUpsert = z.infer<typeof ModelUpsertSchema>;

export const READING_KINDS = ['measure', 'check', 'date'] as const;

export const ReadingTemplateInputSchema = z
  .object({
    id: IdSchema.optional(),
    label: z.string().trim().min(1, 'Name the reading, e.g. "Rear tyre tread".').max(80),
    kind: z.enum(READING_KINDS),
    unit: z.string().trim().max(12).nullable().optional(),
    min: z.number().nullable().optional(),
    max: z.number().nullable().optional(),
    safetyCritical: z.boolean().default(false),
  })
  .superRefine((r, ctx) => {
    if (r.kind === 'measure' && !r.unit) ctx.addIssue({ code: 'custom', path: ['unit'], message: 'A measurement needs its unit, e.g. mm or V.' });
    if (r.min != null && r.max != null && r.min >= r.max) ctx.addIssue({ code: 'custom', path: ['max'], message: 'The upper limit must be above the lower one.' });
    if (r.safetyCritical && r.kind === 'measure' && r.min == null && r.max == null)
      ctx.addIssue({ code: 'custom', path: ['min'], message: 'A safety-critical reading needs a limit that grounds the bike.' });
  });
export type ReadingTemplateInput = z.infer<typeof ReadingTemplateInputSchema>;

export const ServiceItemUpsertSchema = z
  .object({
    name: z.string().trim().min(1, 'Name the service item.').max(80),
    category: z.enum(SERVICE_CATEGORIES),
    everyKm: z.number().int().positive('Use a distance above 0 km.').max(200_000).nullable().optional(),
    everyMonths: z.number().int().positive('Use at least 1 month.').max(240).nullable().optional(),
    firstAtKm: z.number().int().min(0).max(200_000).nullable().optional(),
    rrule: z
      .string()
      .trim()
      .max(200)
      .transform((s) => (s === '' ? null : s))
      .nullable()
      .optional()
      .superRefine((v, ctx) => {
        const problem = v ? validateRule(v) : null;
        if (problem) ctx.addIssue({ code: 'custom', message: problem });
      }),
    safetyCritical: z.boolean().default(false),
    estimatedMinutes: z.number().int().min(1).max(24 * 60).default(30),
    readings: z.array(ReadingTemplateInputSchema).max(20).default([]),
  })
  .refine((i) => i.everyKm != null || i.everyMonths != null || !!i.rrule || i.firstAtKm != null, {
    path: ['everyKm'],
    message: 'Give the interval: every so many km, every so many months, or a calendar rule (or several: whichever comes first).',
  });
export type ServiceItemUpsert = z.infer<typeof ServiceItemUpsertSchema>;
