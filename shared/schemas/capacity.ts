import { z } from 'zod';
import { IdSchema, IsoDateSchema, MAX_NAME } from './common';
import { minutesOf } from '../domain/shifts';

// Workshop capacity: bays, opening hours, technicians' working patterns and time off.

export const MAX_BAYS = 100;
export const MAX_TIME_OFF_DAYS = 366;
export const MAX_LABEL = 80;
export const MAX_REASON = 200;
export const MAX_RULE = 300;

export const TimeSchema = z.string().trim().refine((t) => minutesOf(t) !== null, 'Use a 24-hour time as HH:MM, e.g. 08:00 or 16:30.');

export const CapacityQuerySchema = z.object({ site: IdSchema.optional() });
export type CapacityQuery = z.infer<typeof CapacityQuerySchema>;

export const DayHoursSchema = z
  .object({
    weekday: z.number().int().min(1, 'Weekdays run 1 (Monday) to 7 (Sunday).').max(7, 'Weekdays run 1 (Monday) to 7 (Sunday).'),
    opensAt: TimeSchema,
    closesAt: TimeSchema,
  })
  .refine((h) => (minutesOf(h.closesAt) ?? 0) > (minutesOf(h.opensAt) ?? 0), { message: 'Closing time must be after opening time, e.g. 08:00 to 17:30.', path: ['closesAt'] });
export type DayHours = z.infer<typeof DayHoursSchema>;

/** The whole week: open days only; a weekday left out is closed. */
export const WeekHoursSchema = z.object({
  hours: z
    .array(DayHoursSchema)
    .max(7, 'Give at most one row per weekday.')
    .refine((rows) => new Set(rows.map((r) => r.weekday)).size === rows.length, 'Give each weekday once.'),
});
export type WeekHours = z.infer<typeof WeekHoursSchema>;

export const BayNameSchema = z.string().trim().min(1, 'Name the bay, e.g. Bay 3 or Tyre bay.').max(MAX_NAME);
export const BayCreateSchema = z.object({ name: BayNameSchema.optional() });
export type BayCreate = z.infer<typeof BayCreateSchema>;
export const BayPatchSchema = z
  .object({ name: BayNameSchema.optional(), position: z.number().int().min(1, 'Positions start at 1.').max(MAX_BAYS).optional() })
  .refine((b) => b.name !== undefined || b.position !== undefined, 'Give a new name or a new position for the bay.');
export type BayPatch = z.infer<typeof BayPatchSchema>;

const PatternFields = {
  rrule: z.string().trim().min(1, 'Give a repeat rule, e.g. FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR.').max(MAX_RULE),
  startsOn: IsoDateSchema,
  endsOn: IsoDateSchema.nullable().optional(),
  startTime: TimeSchema,
  endTime: TimeSchema,
  label: z.string().trim().max(MAX_LABEL).nullable().optional(),
};
export const WorkPatternCreateSchema = z.object({ userId: IdSchema, siteId: IdSchema, ...PatternFields });
export type WorkPatternCreate = z.infer<typeof WorkPatternCreateSchema>;
export const WorkPatternPatchSchema = z
  .object({ rrule: PatternFields.rrule.optional(), startsOn: IsoDateSchema.optional(), endsOn: PatternFields.endsOn, startTime: TimeSchema.optional(), endTime: TimeSchema.optional(), label: PatternFields.label })
  .refine((p) => Object.values(p).some((v) => v !== undefined), 'Give at least one field to change.');
export type WorkPatternPatch = z.infer<typeof WorkPatternPatchSchema>;

export const TimeOffCreateSchema = z.object({
  userId: IdSchema,
  firstDay: IsoDateSchema,
  lastDay: IsoDateSchema,
  reason: z.string().trim().max(MAX_REASON).nullable().optional(),
});
export type TimeOffCreate = z.infer<typeof TimeOffCreateSchema>;

// ── Answers ──────────────────────────────────────────────────────────────────
export const BaySchema = z.object({ id: IdSchema, name: z.string(), position: z.number() });
export type Bay = z.infer<typeof BaySchema>;
export const WorkPatternSchema = z.object({
  id: IdSchema, rrule: z.string(), startsOn: z.string(), endsOn: z.string().nullable(), startTime: z.string(), endTime: z.string(), label: z.string().nullable(), words: z.string(),
});
export type WorkPattern = z.infer<typeof WorkPatternSchema>;
export const TimeOffSchema = z.object({ id: IdSchema, firstDay: z.string(), lastDay: z.string(), reason: z.string().nullable() });
export type TimeOff = z.infer<typeof TimeOffSchema>;
export const CapacityTechnicianSchema = z.object({ id: IdSchema, name: z.string(), patterns: z.array(WorkPatternSchema), timeOff: z.array(TimeOffSchema) });
export const CapacitySiteSchema = z.object({
  id: IdSchema,
  name: z.string(),
  timeZone: z.string(),
  bays: z.array(BaySchema),
  hours: z.array(z.object({ weekday: z.number(), opensAt: z.string(), closesAt: z.string() })),
  technicians: z.array(CapacityTechnicianSchema),
});
export type CapacitySite = z.infer<typeof CapacitySiteSchema>;
export const CapacitySchema = z.object({ sites: z.array(CapacitySiteSchema) });
export type Capacity = z.infer<typeof CapacitySchema>;
export const BayAnswerSchema = z.object({ bay: BaySchema });
export const WorkPatternAnswerSchema = z.object({ pattern: WorkPatternSchema });
export const TimeOffAnswerSchema = z.object({ timeOff: TimeOffSchema });
export const HoursAnswerSchema = WeekHoursSchema;
export const DeletedSchema = z.object({ deleted: IdSchema });
