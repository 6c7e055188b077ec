import { z } from 'zod';
import { IdSchema, IsoDateSchema, MAX_NAME } from './common';
import { checkRule, timesProblem } from '../domain/bookings';

/** Most bikes one booking may ask for; no site keeps more of one model. */
export const MAX_QUANTITY = 200;
export const MAX_RULE = 300;
export const MAX_URL = 2000;
/** Longest range the list reads at once. */
export const MAX_RANGE_DAYS = 120;

export const BookingKindSchema = z.enum(['hire', 'lesson'], { message: 'Choose hire or lesson.' });
export type BookingKind = z.infer<typeof BookingKindSchema>;

const OFFSET_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/;
export const InstantSchema = z
  .string({ message: 'Give a time.' })
  .regex(OFFSET_TIME, 'Give the time in ISO 8601 with its offset, e.g. 2026-12-12T09:00:00+00:00.')
  .refine((s) => !Number.isNaN(Date.parse(s)), 'That time does not exist on the calendar.');

const RuleSchema = z
  .string()
  .max(MAX_RULE, `Keep the repeat rule under ${MAX_RULE} characters.`)
  .transform((s, ctx) => {
    if (!s.trim()) return null;
    const c = checkRule(s);
    if (c.ok) return c.rule;
    ctx.addIssue({ code: 'custom', message: c.message });
    return z.NEVER;
  });

export const BookingCreateSchema = z
  .object({
    siteId: IdSchema,
    kind: BookingKindSchema,
    bikeId: IdSchema.nullish(),
    modelId: IdSchema.nullish(),
    quantity: z.number({ message: 'Give the number of bikes as a whole number.' }).int('Give the number of bikes as a whole number.').min(1, 'Book at least one bike.').max(MAX_QUANTITY).default(1),
    start: InstantSchema,
    end: InstantSchema,
    title: z.string().trim().max(MAX_NAME, `Keep the title under ${MAX_NAME} characters.`).default(''),
    rrule: RuleSchema.nullish(),
  })
  .superRefine((b, ctx) => {
    if (!b.bikeId === !b.modelId)
      ctx.addIssue({ code: 'custom', path: ['bikeId'], message: b.bikeId ? 'Book either one bike or a number of bikes of a model, not both.' : 'Name the bike (by fleet number) or the model and how many.' });
    if (b.bikeId && b.quantity !== 1) ctx.addIssue({ code: 'custom', path: ['quantity'], message: 'A booking for one bike has quantity 1. To book several, book the model.' });
    const problem = timesProblem(Date.parse(b.start), Date.parse(b.end));
    if (problem) ctx.addIssue({ code: 'custom', path: ['end'], message: problem });
  });
export type BookingCreate = z.infer<typeof BookingCreateSchema>;
export type BookingCreateInput = z.input<typeof BookingCreateSchema>;

const DayOrInstant = z.union([IsoDateSchema, InstantSchema], { message: 'Use a date as YYYY-MM-DD or a time in ISO 8601 with its offset.' });
export const BookingListQuerySchema = z.object({
  site: IdSchema.optional(),
  from: DayOrInstant.optional(),
  to: DayOrInstant.optional(),
});
export type BookingListQuery = z.infer<typeof BookingListQuerySchema>;

export const OccurrenceSchema = z.object({ start: z.string(), end: z.string() });
export const BookingSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  siteName: z.string(),
  timeZone: z.string(),
  kind: BookingKindSchema,
  bikeId: z.string().nullable(),
  fleetNumber: z.string().nullable(),
  modelId: z.string().nullable(),
  modelName: z.string(),
  quantity: z.number(),
  startAt: z.string(),
  endAt: z.string(),
  rrule: z.string().nullable(),
  ruleText: z.string().nullable(),
  title: z.string(),
  source: z.enum(['manual', 'csv', 'feed']),
  feedId: z.string().nullable(),
  feedName: z.string().nullable(),
  occurrences: z.array(OccurrenceSchema),
});
export type Booking = z.infer<typeof BookingSchema>;
export const BookingListSchema = z.object({ from: z.string(), to: z.string(), items: z.array(BookingSchema) });
export type BookingList = z.infer<typeof BookingListSchema>;
export const BookingDeletedSchema = z.object({ deleted: z.string() });

// ── CSV import ───────────────────────────────────────────────────────────────
export const BOOKING_COLUMNS = ['site', 'kind', 'fleet_number', 'model', 'quantity', 'start', 'end', 'title', 'repeat'] as const;
export const BOOKING_REQUIRED = ['site', 'kind', 'start', 'end'] as const;
export const BookingImportReportSchema = z.object({ imported: z.number(), ids: z.array(z.string()) });
export type BookingImportReport = z.infer<typeof BookingImportReportSchema>;

// ── Calendar feeds ───────────────────────────────────────────────────────────
export const FeedUrlSchema = z
  .string({ message: 'Give the calendar’s address.' })
  .trim()
  .max(MAX_URL)
  .refine((s) => {
    try {
      const u = new URL(s);
      return (u.protocol === 'http:' || u.protocol === 'https:') && !!u.hostname;
    } catch {
      return false;
    }
  }, 'Give the calendar’s web address, starting with https:// or http:// (an .ics link).');

export const FeedCreateSchema = z.object({
  siteId: IdSchema,
  name: z.string({ message: 'Name the calendar.' }).trim().min(1, 'Name the calendar, e.g. “Online hires”.').max(MAX_NAME),
  url: FeedUrlSchema,
  kind: BookingKindSchema.default('hire'),
  defaultModelId: IdSchema.nullish(),
});
export type FeedCreate = z.infer<typeof FeedCreateSchema>;
export type FeedCreateInput = z.input<typeof FeedCreateSchema>;

export const FeedSchema = z.object({
  id: z.string(),
  siteId: z.string(),
  siteName: z.string(),
  name: z.string(),
  url: z.string(),
  kind: BookingKindSchema,
  defaultModelId: z.string().nullable(),
  defaultModelName: z.string().nullable(),
  lastAttemptAt: z.string().nullable(),
  lastGoodAt: z.string().nullable(),
  lastError: z.string().nullable(),
  eventCount: z.number(),
  /** Events of the last good copy that named no bike and no model. */
  skipped: z.number(),
  /** The state in words: "Loaded at 09:45: 42 events." or "Could not load at 10:15: 404 Not Found. Showing the copy from 09:45, 42 events." */
  status: z.string(),
});
export type Feed = z.infer<typeof FeedSchema>;
export const FeedListSchema = z.object({ items: z.array(FeedSchema) });

export const SyncResultSchema = z.object({
  ok: z.boolean(),
  events: z.number(),
  skipped: z.number(),
  error: z.string().nullable(),
  message: z.string(),
});
export type SyncResult = z.infer<typeof SyncResultSchema>;
export const FeedCreatedSchema = z.object({ feed: FeedSchema, result: SyncResultSchema });
