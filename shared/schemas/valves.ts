import { z } from 'zod';
import { IdSchema, IsoDateSchema, MAX_TEXT } from './common';
import { TaskSchema } from './tasks';
import { PartsUsedSchema, TaskPartSchema } from './parts';

const Mm = z.number().min(0).max(5);

export const ValveSlotSchema = z.object({
  valveId: z.string(),
  cylinder: z.number(),
  side: z.enum(['intake', 'exhaust']),
  position: z.number(),
  label: z.string(),
  specMinMm: z.number(),
  specMaxMm: z.number(),
  /** The shim in the valve now as last recorded (shim-under-bucket), or null when unknown. */
  currentShimMm: z.number().nullable(),
  lastAsFoundMm: z.number().nullable(),
});
export type ValveSlotView = z.infer<typeof ValveSlotSchema>;

export const ShimStockLineSchema = z.object({ sizeMm: z.number(), condition: z.enum(['new', 'used']), count: z.number(), minCount: z.number() });
export type ShimStockLine = z.infer<typeof ShimStockLineSchema>;

export const ValveCardSchema = z.object({
  task: TaskSchema,
  adjuster: z.enum(['shim-under-bucket', 'screw-and-locknut']),
  odometerUnit: z.enum(['km', 'mi']),
  latestOdometer: z.number().nullable(),
  valves: z.array(ValveSlotSchema),
  shimSizesMm: z.array(z.number()),
  stock: z.array(ShimStockLineSchema),
  draft: z.unknown().nullable(),
  /** The parts a valve check usually takes (a cover gasket now and then), for the sign-off. */
  parts: z.array(TaskPartSchema).default([]),
});
export type ValveCard = z.infer<typeof ValveCardSchema>;

/** As found: the feeler blades (slides / stops) or a value measured directly. */
export const AsFoundSchema = z.discriminatedUnion('method', [
  z.object({ method: z.literal('feeler'), slidesMm: Mm.nullable(), stopsMm: Mm.nullable() }),
  z.object({ method: z.literal('direct'), mm: Mm }),
]);

export const ValveReadingInputSchema = z.object({
  valveId: z.string().regex(/^c\d+-(intake|exhaust)-\d+$/),
  asFound: AsFoundSchema,
  /** Shim read off (shim-under-bucket), in mm. */
  shimBeforeMm: z.number().min(1).max(4).nullable().optional(),
  /** Shim fitted, when changed. */
  shimAfterMm: z.number().min(1).max(4).nullable().optional(),
  /** Clearance after adjustment; omitted means the valve was left as found. */
  asLeftMm: Mm.nullable().optional(),
  screwAdjusted: z.boolean().optional(),
});
export type ValveReadingInput = z.infer<typeof ValveReadingInputSchema>;

export const CloseValveTaskSchema = z.object({
  version: z.number().int().positive(),
  date: IsoDateSchema.optional(),
  notes: z.string().trim().max(MAX_TEXT).optional(),
  readings: z.array(ValveReadingInputSchema).min(1, 'Record a reading for every valve.').max(64),
  /** A manager may sign off with a valve left outside its spec, saying why. */
  override: z.object({ reason: z.string().trim().min(10, 'Say in a sentence why the valve is left outside its spec.').max(MAX_TEXT) }).optional(),
  parts: PartsUsedSchema.optional(),
});
export type CloseValveTask = z.infer<typeof CloseValveTaskSchema>;

export const ValveDraftSchema = z.object({ readings: z.array(z.record(z.string(), z.unknown())).max(64), savedAt: z.string().optional() });

export const ValveTrendSchema = z.object({
  valveId: z.string(),
  label: z.string(),
  side: z.enum(['intake', 'exhaust']),
  specMinMm: z.number(),
  specMaxMm: z.number(),
  points: z.array(z.object({ odometerKm: z.number(), date: z.string(), asFoundMm: z.number(), asLeftMm: z.number().nullable() })),
  closureMmPer1000Km: z.number().nullable(),
  kmAtSpecMin: z.number().nullable(),
  nextCheckKm: z.number().nullable(),
  tightening: z.boolean(),
  warning: z.boolean(),
});
export type ValveTrendView = z.infer<typeof ValveTrendSchema>;
export const BikeValvesSchema = z.object({ valves: z.array(ValveTrendSchema), adjuster: z.string() });

export const RollupRowSchema = z.object({
  modelId: IdSchema,
  modelName: z.string(),
  position: z.string(),
  bikes: z.number(),
  tightening: z.number(),
  medianMmPer1000Km: z.number().nullable(),
  flagged: z.boolean(),
  suggestion: z.string().nullable(),
});
export const RollupSchema = z.object({ items: z.array(RollupRowSchema) });

export const StockAdjustSchema = z.object({
  siteId: IdSchema,
  sizeMm: z.number().min(1).max(4),
  condition: z.enum(['new', 'used']),
  delta: z.number().int().min(-1000).max(1000).refine((d) => d !== 0, 'Change the count by at least one.'),
  reason: z.string().trim().min(3, 'Say why the count changes, e.g. "delivery" or "counted".').max(200),
});
export const StockMinSchema = z.object({ siteId: IdSchema, sizeMm: z.number().min(1).max(4), minCount: z.number().int().min(0).max(1000) });
