import { desc, eq, sql, type SQL } from 'drizzle-orm';
import type { Db, DbOrTx } from '../db/client';
import { jsonRows, sqlList } from '../db/json-rows';
import { bikes, odometerReadings, users } from '../db/schema';
import type { BikeListQuery, BikeSummary, OdometerReading } from '../../shared/schemas/bikes';
import { fromKm } from '../../shared/domain/units';

interface BikeRow {
  id: string;
  fleet_number: string;
  vin: string | null;
  registration: string | null;
  model_id: string;
  model_name: string;
  site_id: string;
  site_name: string;
  status: BikeSummary['status'];
  status_reason: string | null;
  odometer_unit: BikeSummary['odometerUnit'];
  in_service_date: string;
  in_service_odometer: number;
  l_km: number | null;
  l_value: number | null;
  l_unit: BikeSummary['odometerUnit'] | null;
  l_date: string | null;
}

/**
 * The bikes as the register lists them, by fleet number, each with its latest reading (the highest
 * continuous distance recorded: one probe of the (bike, km) index per bike, whatever the length of
 * its history). Rows come back as one JSON value (see jsonRows).
 */
export async function listBikes(db: DbOrTx, siteIds: string[], f: BikeListQuery & { ids?: string[] } = {}): Promise<BikeSummary[]> {
  if (!siteIds.length) return [];
  const where: SQL[] = [sql`b.site_id in (${sqlList(siteIds)})`];
  if (f.siteId) where.push(sql`b.site_id = ${f.siteId}`);
  if (f.modelId) where.push(sql`b.model_id = ${f.modelId}`);
  if (f.status) where.push(sql`b.status = ${f.status}`);
  if (f.ids) where.push(sql`b.id in (${sqlList(f.ids)})`);
  if (f.q) {
    const like = `%${f.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    where.push(sql`(b.fleet_number ilike ${like} or b.registration ilike ${like})`);
  }
  const rows = await jsonRows<BikeRow>(
    db,
    sql`select b.id, b.fleet_number, b.vin, b.registration, m.id as model_id, m.name as model_name, s.id as site_id, s.name as site_name,
               b.status, b.status_reason, b.odometer_unit, b.in_service_date, b.in_service_odometer,
               l.odometer_km as l_km, l.value as l_value, l.unit as l_unit, l.date as l_date,
               row_number() over (order by b.fleet_number) as n
          from bikes b
          join bike_models m on m.id = b.model_id
          join sites s on s.id = b.site_id
          left join lateral (select r.odometer_km, r.value, r.unit, r.date from odometer_readings r
                              where r.bike_id = b.id order by r.odometer_km desc, r.created_at desc limit 1) l on true
         where ${sql.join(where, sql` and `)}`,
    sql`q.n`,
  );
  return rows.map((b) => ({
    id: b.id,
    fleetNumber: b.fleet_number,
    vin: b.vin,
    registration: b.registration,
    model: { id: b.model_id, name: b.model_name },
    site: { id: b.site_id, name: b.site_name },
    status: b.status,
    statusReason: b.status_reason,
    odometerUnit: b.odometer_unit,
    inServiceDate: b.in_service_date,
    inServiceOdometer: b.in_service_odometer,
    latestOdometer: b.l_km == null ? null : b.l_unit === b.odometer_unit ? b.l_value : fromKm(b.l_km, b.odometer_unit),
    latestOdometerKm: b.l_km,
    latestReadingDate: b.l_date,
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
