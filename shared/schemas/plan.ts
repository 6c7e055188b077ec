import { z } from 'zod';
import { IdSchema, IsoDateSchema } from './common';

// The workshop plan as the API gives it. Instants are ISO 8601 strings in UTC ("2026-12-08T09:00:00.000Z");
// days are YYYY-MM-DD at the site.

export const PlanQuerySchema = z
  .object({
    site: IdSchema.optional(),
    from: IsoDateSchema.optional(),
    to: IsoDateSchema.optional(),
  })
  .refine((q) => !q.from || !q.to || q.from <= q.to, { message: 'The first day must not be after the last. Swap "from" and "to".', path: ['to'] });
export type PlanQuery = z.infer<typeof PlanQuerySchema>;

export const PlanVisitTaskSchema = z.object({
  id: IdSchema,
  itemName: z.string(),
  minutes: z.number(),
  dueDate: z.string().nullable(),
  safetyCritical: z.boolean(),
  status: z.string(),
});

export const PlanVisitSchema = z.object({
  id: IdSchema,
  bikeId: IdSchema,
  fleetNumber: z.string(),
  modelName: z.string(),
  siteId: IdSchema,
  start: z.string(),
  end: z.string(),
  bayId: IdSchema,
  bayName: z.string(),
  technicianId: IdSchema,
  technicianName: z.string(),
  taskIds: z.array(IdSchema),
  tasks: z.array(PlanVisitTaskSchema),
  latestDate: z.string(),
  /** Placed by a person: the planner leaves it where it is. */
  pinned: z.boolean(),
  sequence: z.number(),
  /** Why it stands where it does, in words. */
  why: z.array(z.string()),
});
export type PlanVisit = z.infer<typeof PlanVisitSchema>;

export const PlanUnplacedSchema = z.object({
  taskId: IdSchema,
  bikeId: IdSchema,
  fleetNumber: z.string(),
  siteId: IdSchema,
  itemName: z.string(),
  dueDate: z.string().nullable(),
  reason: z.string(),
  remedy: z.string(),
});
export type PlanUnplaced = z.infer<typeof PlanUnplacedSchema>;

export const PlanCapacitySchema = z.object({
  siteId: IdSchema,
  date: z.string(),
  plannedMinutes: z.number(),
  availableMinutes: z.number(),
});
export type PlanCapacity = z.infer<typeof PlanCapacitySchema>;

/** When each bike on the board is needed (its own bookings and its model's at its site), for drawing. */
export const PlanBookingSchema = z.object({
  bookingId: IdSchema,
  siteId: IdSchema,
  bikeId: IdSchema.nullable(),
  modelId: IdSchema.nullable(),
  modelName: z.string().nullable(),
  quantity: z.number(),
  kind: z.enum(['hire', 'lesson']),
  title: z.string(),
  start: z.string(),
  end: z.string(),
});
export type PlanBooking = z.infer<typeof PlanBookingSchema>;

export const PlanBoardRowSchema = z.object({ id: IdSchema, siteId: IdSchema, name: z.string() });

export const PlanAnswerSchema = z.object({
  from: z.string(),
  to: z.string(),
  visits: z.array(PlanVisitSchema),
  unplaced: z.array(PlanUnplacedSchema),
  capacity: z.array(PlanCapacitySchema),
  bookings: z.array(PlanBookingSchema),
  bays: z.array(PlanBoardRowSchema),
  technicians: z.array(PlanBoardRowSchema),
  /** When the plan was last worked out (ISO instant), or null before the first run. */
  plannedAt: z.string().nullable(),
});
export type PlanAnswer = z.infer<typeof PlanAnswerSchema>;

export const PlanRunSchema = z.object({ site: IdSchema.optional() });

export const VisitMoveSchema = z.object({
  start: z.iso.datetime({ offset: true, message: 'Give the start as an ISO 8601 date and time, e.g. 2026-12-08T09:00:00Z.' }),
  bayId: IdSchema,
  technicianId: IdSchema,
});
export type VisitMove = z.infer<typeof VisitMoveSchema>;

/** A technician's day: their visits in order, with the tasks of each. */
export const MyDaySchema = z.object({
  date: z.string(),
  visits: z.array(PlanVisitSchema),
});
export type MyDay = z.infer<typeof MyDaySchema>;

export const MyDayQuerySchema = z.object({ date: IsoDateSchema.optional() });

/** Visits in the next two days for the bikes at the caller's sites: what the desk sees at check-in. */
export const NextVisitSchema = z.object({
  bikeId: IdSchema,
  visitId: IdSchema,
  start: z.string(),
  end: z.string(),
  bayName: z.string(),
  siteTimeZone: z.string(),
  /** The visit starts today at the bike's site: hand the bike out only after a warning. */
  today: z.boolean(),
});
export type NextVisit = z.infer<typeof NextVisitSchema>;
export const NextVisitsSchema = z.object({ items: z.array(NextVisitSchema) });

/** What the manager sets for planning. */
export const PlanSettingsSchema = z.object({
  /** Items falling due within this many days of a bike's earliest come in the same visit … */
  windowDays: z.number().int().min(0, 'Use 0 days or more.').max(60, 'Use at most 60 days.').default(14),
  /** … or within this many km of riding, whichever comes first. */
  windowKm: z.number().int().min(0, 'Use 0 km or more.').max(10_000, 'Use at most 10,000 km.').default(600),
  /** How many days ahead the plan reaches, today included. */
  horizonDays: z.number().int().min(1, 'Plan at least one day.').max(42, 'Plan at most six weeks ahead.').default(14),
});
export type PlanSettings = z.infer<typeof PlanSettingsSchema>;
