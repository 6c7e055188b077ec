import { z } from 'zod';
import { IdSchema } from './common';

export const SiteSchema = z.object({ id: IdSchema, name: z.string(), timeZone: z.string(), bays: z.number() });
export type Site = z.infer<typeof SiteSchema>;
export const SiteListSchema = z.object({ items: z.array(SiteSchema) });

export const SiteCreateSchema = z.object({
  name: z.string().trim().min(1, 'Name the site, e.g. the depot or training ground.').max(120),
  timeZone: z
    .string()
    .trim()
    .refine((tz) => {
      try {
        new Intl.DateTimeFormat('en', { timeZone: tz });
        return true;
      } catch {
        return false;
      }
    }, 'Use an IANA time zone name, e.g. Europe/London.'),
  bays: z.number().int().min(0).max(100).default(1),
});

export const ModelSummarySchema = z.object({
  id: IdSchema,
  name: z.string(),
  cylinders: z.number(),
  intakeValvesPerCylinder: z.number(),
  exhaustValvesPerCylinder: z.number(),
  adjuster: z.enum(['shim-under-bucket', 'screw-and-locknut']),
  intakeMinMm: z.number(),
  intakeMaxMm: z.number(),
  exhaustMinMm: z.number(),
  exhaustMaxMm: z.number(),
  shimMinMm: z.number().nullable(),
  shimMaxMm: z.number().nullable(),
  shimStepMm: z.number().nullable(),
});
export type ModelSummary = z.infer<typeof ModelSummarySchema>;
export const ModelListSchema = z.object({ items: z.array(ModelSummarySchema) });
