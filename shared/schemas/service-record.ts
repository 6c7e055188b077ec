import { z } from 'zod';
import { IdSchema, OdometerUnitSchema } from './common';
import { BIKE_STATUSES } from './bikes';
import { ModelSummarySchema } from './reference';

export const ValveReadingViewSchema = z.object({
  valveId: z.string(),
  label: z.string(),
  side: z.enum(['intake', 'exhaust']),
  asFoundMm: z.number(),
  asLeftMm: z.number().nullable(),
  shimBeforeMm: z.number().nullable(),
  shimAfterMm: z.number().nullable(),
  method: z.string(),
  specMinMm: z.number(),
  specMaxMm: z.number(),
  /** Whether the clearance the valve was left at (as found when not adjusted) is within spec. */
  inSpec: z.boolean(),
});
export type ValveReadingView = z.infer<typeof ValveReadingViewSchema>;

export const MeasuredReadingSchema = z.object({
  label: z.string(),
  kind: z.enum(['measure', 'check', 'date']),
  unit: z.string().nullable(),
  value: z.number().nullable(),
  done: z.boolean().nullable(),
  dateValue: z.string().nullable(),
  min: z.number().nullable(),
  max: z.number().nullable(),
  outOfLimits: z.boolean(),
  safetyCritical: z.boolean(),
});
export type MeasuredReading = z.infer<typeof MeasuredReadingSchema>;

export const ServiceDoneSchema = z.object({
  id: z.string(),
  date: z.string(),
  /** As the bike's odometer showed it, in odometerUnit. */
  odometer: z.number(),
  odometerKm: z.number(),
  item: z.string(),
  category: z.string(),
  safetyCritical: z.boolean(),
  signedOffBy: z.string().nullable(),
  notes: z.string().nullable(),
  valveReadings: z.array(ValveReadingViewSchema),
  readings: z.array(MeasuredReadingSchema),
});
export type ServiceDone = z.infer<typeof ServiceDoneSchema>;

export const ServiceRecordSchema = z.object({
  generatedAt: z.string(),
  site: z.object({ id: IdSchema, name: z.string(), timeZone: z.string() }),
  bike: z.object({
    id: IdSchema,
    fleetNumber: z.string(),
    vin: z.string().nullable(),
    registration: z.string().nullable(),
    status: z.enum(BIKE_STATUSES),
    statusReason: z.string().nullable(),
    odometerUnit: OdometerUnitSchema,
    inServiceDate: z.string(),
    inServiceOdometer: z.number(),
    latestOdometer: z.number().nullable(),
    latestReadingDate: z.string().nullable(),
  }),
  model: ModelSummarySchema,
  services: z.array(ServiceDoneSchema),
  defects: z.array(
    z.object({
      id: IdSchema,
      reportedAt: z.string(),
      category: z.string(),
      text: z.string(),
      safetyCritical: z.boolean(),
      reportedBy: z.string().nullable(),
      resolvedAt: z.string().nullable(),
    }),
  ),
  statusChanges: z.array(
    z.object({ at: z.string(), from: z.string().nullable(), to: z.string(), reason: z.string().nullable(), by: z.string().nullable() }),
  ),
});
export type ServiceRecord = z.infer<typeof ServiceRecordSchema>;
