import { and, desc, eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { bikes, odometerReadings } from '../db/schema';
import { cumulativeFromDisplay, type OdometerSegment } from '../../shared/domain/odometer';
import { toKm } from '../../shared/domain/units';

type AnchorBike = Pick<typeof bikes.$inferSelect, 'id' | 'inServiceDate' | 'inServiceOdometer' | 'odometerUnit'>;

/**
 * The odometer each bike has fitted now, tied to the continuous km scale: the latest replacement
 * recorded, else the odometer the bike entered service with. One query for any number of bikes.
 */
export async function currentOdometers(db: DbOrTx, list: readonly AnchorBike[]): Promise<Map<string, OdometerSegment>> {
  const out = new Map<string, OdometerSegment>();
  for (const b of list) out.set(b.id, inServiceOdometer(b));
  if (!list.length) return out;
  const resets = await db
    .selectDistinctOn([odometerReadings.bikeId], { bikeId: odometerReadings.bikeId, km: odometerReadings.odometerKm, value: odometerReadings.value, unit: odometerReadings.unit, date: odometerReadings.date })
    .from(odometerReadings)
    .where(and(inArray(odometerReadings.bikeId, list.map((b) => b.id)), eq(odometerReadings.reset, true)))
    .orderBy(odometerReadings.bikeId, desc(odometerReadings.odometerKm));
  for (const r of resets) out.set(r.bikeId, { startCumulativeKm: r.km, startValue: r.value, unit: r.unit, startDate: r.date });
  return out;
}

/** The odometer a bike entered service with, on the continuous km scale. */
export const inServiceOdometer = (b: AnchorBike): OdometerSegment => ({
  startCumulativeKm: toKm(b.inServiceOdometer, b.odometerUnit),
  startValue: b.inServiceOdometer,
  unit: b.odometerUnit,
  startDate: b.inServiceDate,
});

/** The continuous km for a value read off the bike's current odometer. */
export const continuousKm = (value: number, unit: OdometerSegment['unit'], odometer: OdometerSegment) => cumulativeFromDisplay(value, odometer, unit);
