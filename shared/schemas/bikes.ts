import { z } from 'zod';
import { IdSchema, IsoDateSchema, MAX_TEXT, OdometerUnitSchema } from './common';
import { DueItemSchema } from './due';

export const BIKE_STATUSES = ['in_service', 'in_workshop', 'out_of_service', 'retired'] as const;
export type BikeStatus = (typeof BIKE_STATUSES)[number];

/** Words shown for a status; the codes never reach the screen. */
export const BIKE_STATUS_LABELS: Record<BikeStatus, string> = {
  in_service: 'Ready to ride',
  in_workshop: 'In the workshop',
  out_of_service: 'Grounded',
  retired: 'Retired',
};

// ISO 3779: 17 characters, digits and capital letters except I, O and Q.
export const VIN_PATTERN = /^[A-HJ-NPR-Z0-9]{17}$/;

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max)
    .transform((s) => (s === '' ? null : s))
    .nullable()
    .optional();

export const VinSchema = z
  .string()
  .trim()
  .toUpperCase()
  .transform((s) => (s === '' ? null : s))
  .nullable()
  .optional()
  .refine(
    (v) => v == null || VIN_PATTERN.test(v),
    'A VIN has 17 characters: digits and capital letters except I, O and Q. Leave it empty for a bike without one.',
  );

export const FleetNumberSchema = z
  .string()
  .trim()
  .min(1, 'Enter the fleet number painted on the bike, e.g. SM-07.')
  .max(20, 'A fleet number has at most 20 characters.')
  .regex(/^[A-Za-z0-9][A-Za-z0-9 ._/-]*$/, 'Use letters, digits, spaces, dots, dashes or slashes.');

export const BikeCreateSchema = z.object({
  fleetNumber: FleetNumberSchema,
  vin: VinSchema,
  registration: optionalText(20),
  modelId: IdSchema,
  siteId: IdSchema,
  odometerUnit: OdometerUnitSchema.default('km'),
  inServiceDate: IsoDateSchema,
  inServiceOdometer: z.number().min(0, 'The odometer cannot be negative.').max(2_000_000).default(0),
});
export type BikeCreate = z.infer<typeof BikeCreateSchema>;

export const BikeUpdateSchema = z.object({
  fleetNumber: FleetNumberSchema.optional(),
  vin: VinSchema,
  registration: optionalText(20),
  modelId: IdSchema.optional(),
  siteId: IdSchema.optional(),
});
export type BikeUpdate = z.infer<typeof BikeUpdateSchema>;

export const BikeStatusChangeSchema = z
  .object({
    status: z.enum(BIKE_STATUSES),
    reason: optionalText(MAX_TEXT),
  })
  .refine((v) => v.status !== 'out_of_service' || !!v.reason, {
    path: ['reason'],
    message: 'Say why the bike is grounded, so the desk can tell a rider.',
  });
export type BikeStatusChange = z.infer<typeof BikeStatusChangeSchema>;

export const BikeListQuerySchema = z.object({
  siteId: IdSchema.optional(),
  modelId: IdSchema.optional(),
  status: z.enum(BIKE_STATUSES).optional(),
  q: z.string().trim().max(40).optional(),
});
export type BikeListQuery = z.infer<typeof BikeListQuerySchema>;

export const BikeSummarySchema = z.object({
  id: IdSchema,
  fleetNumber: z.string(),
  vin: z.string().nullable(),
  registration: z.string().nullable(),
  model: z.object({ id: IdSchema, name: z.string() }),
  site: z.object({ id: IdSchema, name: z.string() }),
  status: z.enum(BIKE_STATUSES),
  statusReason: z.string().nullable(),
  odometerUnit: OdometerUnitSchema,
  inServiceDate: z.string(),
  inServiceOdometer: z.number(),
  /** Latest odometer as the bike's own instrument shows it, in odometerUnit. */
  latestOdometer: z.number().nullable(),
  latestOdometerKm: z.number().nullable(),
  latestReadingDate: z.string().nullable(),
});
export type BikeSummary = z.infer<typeof BikeSummarySchema>;
export const BikeListSchema = z.object({ items: z.array(BikeSummarySchema) });

export const OdometerReadingSchema = z.object({
  id: IdSchema,
  date: z.string(),
  value: z.number(),
  unit: OdometerUnitSchema,
  odometerKm: z.number(),
  reset: z.boolean(),
  source: z.string(),
  recordedBy: z.string().nullable(),
});
export type OdometerReading = z.infer<typeof OdometerReadingSchema>;

export const RideVerdictSchema = z.object({ mayRide: z.boolean(), reasons: z.array(z.string()) });

export const BikeDetailSchema = z.object({
  bike: BikeSummarySchema,
  readings: z.array(OdometerReadingSchema),
  due: z.array(DueItemSchema),
  ride: RideVerdictSchema,
});

export const CheckInResultSchema = z.object({
  reading: z.object({ id: IdSchema, date: z.string(), value: z.number(), unit: OdometerUnitSchema, odometerKm: z.number(), reset: z.boolean() }),
  bike: BikeSummarySchema,
  due: z.array(DueItemSchema),
  grounded: z.boolean(),
  /** The defect reported with the check-in, so photos can be attached to it. */
  defectId: IdSchema.nullable(),
  ride: RideVerdictSchema,
});
export type BikeDetail = z.infer<typeof BikeDetailSchema>;
