import { z } from 'zod';
import { IdSchema, IsoDateSchema, MAX_TEXT, OdometerUnitSchema } from './common';
import { WorkRowSchema } from './work-row';

export const DUE_STATUSES = ['ok', 'soon', 'overdue'] as const;
export const DueStatusSchema = z.enum(DUE_STATUSES);

export const DueItemSchema = WorkRowSchema.extend({
  status: DueStatusSchema,
  dueAtKm: z.number().nullable(),
  dueByDate: z.string().nullable(),
  trigger: z.enum(['km', 'calendar']).nullable(),
  remainingKm: z.number().nullable(),
  remainingDays: z.number().nullable(),
  usageKmPerDay: z.number().nullable(),
  odometerUnit: OdometerUnitSchema,
  /** Distance left in the bike's own odometer unit. */
  remainingInUnit: z.number().nullable(),
  lastDoneDate: z.string().nullable(),
  taskId: IdSchema.nullable(),
});
export type DueItem = z.infer<typeof DueItemSchema>;
export const DueListSchema = z.object({ items: z.array(DueItemSchema), today: z.string() });

export const DueQuerySchema = z.object({
  within: z.coerce.number().int().min(0, 'Use a window of 0 to 366 days.').max(366, 'Use a window of 0 to 366 days.').default(7),
  siteId: IdSchema.optional(),
  modelId: IdSchema.optional(),
  status: DueStatusSchema.optional(),
  item: z.string().trim().max(120).optional(),
});
export type DueQuery = z.infer<typeof DueQuerySchema>;

export const DEFECT_CATEGORIES = ['brakes', 'tyres', 'engine', 'chain', 'lights', 'bodywork', 'other'] as const;
export const DEFECT_LABELS: Record<(typeof DEFECT_CATEGORIES)[number], string> = {
  brakes: 'Brakes',
  tyres: 'Tyres',
  engine: 'Engine',
  chain: 'Chain and sprockets',
  lights: 'Lights and electrics',
  bodywork: 'Bodywork and controls',
  other: 'Something else',
};

export const CheckInSchema = z.object({
  odometer: z
    .number({ message: 'Type the odometer reading as a number.' })
    .min(0, 'An odometer reading cannot be negative.')
    .max(2_000_000, 'That reading is larger than any odometer shows. Check the digits.'),
  date: IsoDateSchema.optional(),
  /** A replaced or reset odometer: the reading is the new instrument's start. */
  reset: z.boolean().optional(),
  /** The desk saw the warning about an unusually large distance and confirms the reading. */
  confirmLargeJump: z.boolean().optional(),
  defect: z
    .object({
      category: z.enum(DEFECT_CATEGORIES, { message: 'Choose what the defect concerns.' }),
      text: z.string().trim().min(3, 'Say in a few words what is wrong.').max(MAX_TEXT),
      safetyCritical: z.boolean().default(false),
    })
    .optional(),
});
export type CheckIn = z.infer<typeof CheckInSchema>;
