import { z } from 'zod';
import { IdSchema } from '../../../shared/schemas/common';
import { ModelSummarySchema } from '../../../shared/schemas/reference';
import { READING_KINDS, SERVICE_CATEGORIES } from '../../../shared/schemas/plans';

export const PlanReadingSchema = z.object({
  id: IdSchema,
  label: z.string(),
  kind: z.enum(READING_KINDS),
  unit: z.string().nullable(),
  min: z.number().nullable(),
  max: z.number().nullable(),
  safetyCritical: z.boolean(),
});

export const PlanItemSchema = z.object({
  id: IdSchema,
  name: z.string(),
  category: z.enum(SERVICE_CATEGORIES),
  everyKm: z.number().nullable(),
  everyMonths: z.number().nullable(),
  firstAtKm: z.number().nullable(),
  rrule: z.string().nullable(),
  ruleText: z.string().nullable(),
  safetyCritical: z.boolean(),
  estimatedMinutes: z.number(),
  readings: z.array(PlanReadingSchema),
});
export type PlanItem = z.infer<typeof PlanItemSchema>;

/** A model with its service plan, as GET /api/models/:id and every plan change answer. */
export const ModelDetailSchema = z.object({
  model: ModelSummarySchema,
  /** Bikes of the model not retired: the ones whose dues a change moves. */
  bikes: z.number(),
  items: z.array(PlanItemSchema),
});
export type ModelDetail = z.infer<typeof ModelDetailSchema>;

export const ModelSavedSchema = ModelDetailSchema.extend({ bikesRecomputed: z.number().optional() });
export const ItemSavedSchema = ModelDetailSchema.extend({ id: IdSchema.optional(), bikesRecomputed: z.number() });
