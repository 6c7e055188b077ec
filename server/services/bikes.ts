import { and, asc, desc, eq, ilike, inArray, or, sql, type SQL } from 'drizzle-orm';
import type { Db } from '../db/client';
import { bikeModels, bikes, odometerReadings, sites, users } from '../db/schema';
import type { BikeListQuery, BikeSummary, OdometerReading } from '../../shared/schemas/bikes';
import { fromKm } from '../../shared/domain/units';

/**
 * The latest reading of each bike listed, the highest continuous distance recorded: one probe of the
 * (bike, km) index per bike, whatever the length of its history.
 */
const latest = (db: Db) =>
  db
    .select({
      bikeId: odometerReadings.bikeId,
      odometerKm: odometerReadings.odometerKm,
      value: odometerReadings.value,
      unit: odometerReadings.unit,
      date: odometerReadings.date,
    })
    .from(odometerReadings)
    .where(eq(odometerReadings.bikeId, bikes.id))
    .orderBy(desc(odometerReadings.odometerKm), desc(odometerReadings.createdAt))
    .limit(1)
    .as('latest');

export async function listBikes(db: Db, siteIds: string[], f: BikeListQuery & { ids?: string[] } = {}): Promise<BikeSummary[]> {
  if (!siteIds.length) return [];
  const where: SQL[] = [inArray(bikes.siteId, siteIds)];
  if (f.siteId) where.push(eq(bikes.siteId, f.siteId));
  if (f.modelId) where.push(eq(bikes.modelId, f.modelId));
  if (f.status) where.push(eq(bikes.status, f.status));
  if (f.ids) where.push(inArray(bikes.id, f.ids.length ? f.ids : ['00000000-0000-0000-0000-000000000000']));
  if (f.q) {
    const like = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    where.push(or(ilike(bikes.fleetNumber, like), ilike(bikes.registration, like))!);
  }
  const l = latest(db);
  const rows = await db
    .select({ bike: bikes, model: { id: bikeModels.id, name: bikeModels.name }, site: { id: sites.id, name: sites.name }, lKm: l.odometerKm, lValue: l.value, lUnit: l.unit, lDate: l.date })
    .from(bikes)
    .innerJoin(bikeModels, eq(bikeModels.id, bikes.modelId))
    .innerJoin(sites, eq(sites.id, bikes.siteId))
    .leftJoinLateral(l, sql`true`)
    .where(and(...where))
    .orderBy(asc(bikes.fleetNumber));
  return rows.map(({ bike: b, model, site, lKm, lValue, lUnit, lDate }) => ({
    id: b.id,
    fleetNumber: b.fleetNumber,
    vin: b.vin,
    registration: b.registration,
    model,
    site,
    status: b.status,
    statusReason: b.statusReason,
    odometerUnit: b.odometerUnit,
    inServiceDate: b.inServiceDate,
    inServiceOdometer: b.inServiceOdometer,
    latestOdometer: lKm == null ? null : lUnit === b.odometerUnit ? lValue : fromKm(lKm, b.odometerUnit),
    latestOdometerKm: lKm,
    latestReadingDate: lDate,
  }));
}

export async function getBike(db: Db, siteIds: string[], id: string) {
  const [bike] = await listBikes(db, siteIds, { ids: [id] });
  return bike ?? null;
}

export async function readingsOf(db: Db, bikeId: string, limit = 400): Promise<OdometerReading[]> {
  const rows = await db
    .select({ r: odometerReadings, by: users.name })
    .from(odometerReadings)
    .leftJoin(users, eq(users.id, odometerReadings.recordedBy))
    .where(eq(odometerReadings.bikeId, bikeId))
    .orderBy(desc(odometerReadings.date), desc(odometerReadings.odometerKm))
    .limit(limit);
  return rows.map(({ r, by }) => ({
    id: r.id,
    date: r.date,
    value: r.value,
    unit: r.unit,
    odometerKm: r.odometerKm,
    reset: r.reset,
    source: r.source,
    recordedBy: by,
  }));
}

export const fleetNumberTaken = async (db: Pick<Db, 'select'>, fleetNumber: string, exceptId?: string) => {
  const rows = await db
    .select({ id: bikes.id })
    .from(bikes)
    .where(sql`lower(${bikes.fleetNumber}) = lower(${fleetNumber})`);
  return rows.some((r) => r.id !== exceptId);
};
