import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { auditLog, bikeModels, defects, odometerReadings, serviceItems, serviceReadings, serviceRecords, sites, users, valveChecks, valveReadings } from '../db/schema';
import { displayFromCumulative, type OdometerSegment } from '../../shared/domain/odometer';
import { valveId, valveLabel } from '../../shared/domain/valves';
import { toKm } from '../../shared/domain/units';
import type { ServiceDone, ServiceRecord, ValveReadingView } from '../../shared/schemas/service-record';
import { getBike } from './bikes';
import { toModelSummary } from './models';

const mmOrNull = (um: number | null) => (um == null ? null : um / 1000);
const round1 = (n: number) => Math.round(n * 10) / 10;

/** Every odometer the bike has had, oldest first, so a distance can be shown as the odometer of the day read it. */
async function odometersOf(db: DbOrTx, bike: { id: string; inServiceDate: string; inServiceOdometer: number; odometerUnit: 'km' | 'mi' }): Promise<OdometerSegment[]> {
  const resets = await db
    .select()
    .from(odometerReadings)
    .where(and(eq(odometerReadings.bikeId, bike.id), eq(odometerReadings.reset, true)))
    .orderBy(asc(odometerReadings.odometerKm), asc(odometerReadings.createdAt));
  return [
    { startCumulativeKm: toKm(bike.inServiceOdometer, bike.odometerUnit), startValue: bike.inServiceOdometer, unit: bike.odometerUnit, startDate: bike.inServiceDate },
    ...resets.map((r) => ({ startCumulativeKm: r.odometerKm, startValue: r.value, unit: r.unit, startDate: r.date })),
  ];
}

export const odometerAt = (km: number, odometers: OdometerSegment[]) =>
  round1(displayFromCumulative(km, odometers.filter((o) => o.startCumulativeKm <= km).at(-1) ?? odometers[0]));

/** The bike's whole service story for an owner, an insurer or a buyer; null for a bike the person may not see. */
export async function serviceRecordOf(db: DbOrTx, siteIds: string[], bikeId: string, now: Date): Promise<ServiceRecord | null> {
  const bike = await getBike(db, siteIds, bikeId);
  if (!bike) return null;
  // One after the other: inside a transaction there is one connection, which runs one query at a time.
  const [model] = await db.select().from(bikeModels).where(eq(bikeModels.id, bike.model.id));
  const [site] = await db.select({ id: sites.id, name: sites.name, timeZone: sites.timeZone }).from(sites).where(eq(sites.id, bike.site.id));
  const odometers = await odometersOf(db, bike);
  const records = await db
    .select({ r: serviceRecords, item: { name: serviceItems.name, category: serviceItems.category, safetyCritical: serviceItems.safetyCritical }, by: users.name })
    .from(serviceRecords)
    .innerJoin(serviceItems, eq(serviceItems.id, serviceRecords.serviceItemId))
    .leftJoin(users, eq(users.id, serviceRecords.doneBy))
    .where(eq(serviceRecords.bikeId, bikeId))
    .orderBy(asc(serviceRecords.date), asc(serviceRecords.odometerKm), asc(serviceRecords.createdAt));
  const measured = records.length
    ? await db.select().from(serviceReadings).where(inArray(serviceReadings.serviceRecordId, records.map((r) => r.r.id)))
    : [];
  const checks = await db
    .select({ c: valveChecks, v: valveReadings })
    .from(valveReadings)
    .innerJoin(valveChecks, eq(valveChecks.id, valveReadings.checkId))
    .where(eq(valveChecks.bikeId, bikeId))
    // Along the head as a technician works: cylinder by cylinder, intake before exhaust.
    .orderBy(asc(valveReadings.cylinder), sql`${valveReadings.side} = 'exhaust'`, asc(valveReadings.position));

  const spec = (side: 'intake' | 'exhaust') => (side === 'intake' ? [model.intakeMinUm, model.intakeMaxUm] : [model.exhaustMinUm, model.exhaustMaxUm]);
  const byCheck = new Map<string, { check: typeof valveChecks.$inferSelect; valves: ValveReadingView[] }>();
  for (const { c, v } of checks) {
    const [min, max] = spec(v.side);
    const left = v.asLeftUm ?? v.asFoundUm;
    const entry = byCheck.get(c.id) ?? { check: c, valves: [] };
    entry.valves.push({
      valveId: valveId(v.cylinder, v.side, v.position), label: valveLabel(v.cylinder, v.side, v.position, model), side: v.side,
      asFoundMm: v.asFoundUm / 1000, asLeftMm: mmOrNull(v.asLeftUm), shimBeforeMm: mmOrNull(v.shimBeforeUm), shimAfterMm: mmOrNull(v.shimAfterUm),
      method: v.method, specMinMm: min / 1000, specMaxMm: max / 1000, inSpec: left >= min && left <= max,
    });
    byCheck.set(c.id, entry);
  }
  // A valve check belongs to the service signed off with it: the same task, else a valve service of the same day.
  const unclaimed = [...byCheck.values()];
  const claim = (r: (typeof records)[number]['r'], category: string) => {
    const i = unclaimed.findIndex((e) => (r.taskId && e.check.taskId === r.taskId) || (category === 'valves' && !e.check.taskId && e.check.date === r.date));
    return i < 0 ? [] : unclaimed.splice(i, 1)[0].valves;
  };
  const services: ServiceDone[] = records.map(({ r, item, by }) => ({
    id: r.id, date: r.date, odometer: odometerAt(r.odometerKm, odometers), odometerKm: round1(r.odometerKm),
    item: item.name, category: item.category, safetyCritical: item.safetyCritical, signedOffBy: by, notes: r.notes,
    valveReadings: claim(r, item.category),
    readings: measured.filter((m) => m.serviceRecordId === r.id).map(({ label, kind, unit, value, done, dateValue, min, max, outOfLimits, safetyCritical }) => ({ label, kind, unit, value, done, dateValue, min, max, outOfLimits, safetyCritical })),
  }));
  // Checks stored without a matching service still belong in the record.
  for (const e of unclaimed)
    services.push({
      id: e.check.id, date: e.check.date, odometer: odometerAt(e.check.odometerKm, odometers), odometerKm: round1(e.check.odometerKm),
      item: 'Valve clearance check', category: 'valves', safetyCritical: false, signedOffBy: await nameOf(db, e.check.checkedBy), notes: null, valveReadings: e.valves, readings: [],
    });
  services.sort((a, b) => a.date.localeCompare(b.date) || a.odometerKm - b.odometerKm);

  const defectRows = await db
    .select({ d: defects, by: users.name })
    .from(defects)
    .leftJoin(users, eq(users.id, defects.reportedBy))
    .where(eq(defects.bikeId, bikeId))
    .orderBy(asc(defects.reportedAt));
  const statusRows = await db
    .select({ at: auditLog.at, changes: auditLog.changes, by: users.name })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.userId))
    .where(and(eq(auditLog.entity, 'bike'), eq(auditLog.entityId, bikeId), sql`jsonb_typeof(${auditLog.changes}->'status') = 'array'`))
    .orderBy(asc(auditLog.at), asc(auditLog.id));

  return {
    generatedAt: now.toISOString(),
    site,
    bike: {
      id: bike.id, fleetNumber: bike.fleetNumber, vin: bike.vin, registration: bike.registration, status: bike.status, statusReason: bike.statusReason,
      odometerUnit: bike.odometerUnit, inServiceDate: bike.inServiceDate, inServiceOdometer: bike.inServiceOdometer,
      latestOdometer: bike.latestOdometer == null ? null : round1(bike.latestOdometer), latestReadingDate: bike.latestReadingDate,
    },
    model: toModelSummary(model),
    services,
    defects: defectRows.map(({ d, by }) => ({
      id: d.id, reportedAt: d.reportedAt.toISOString(), category: d.category, text: d.text, safetyCritical: d.safetyCritical, reportedBy: by, resolvedAt: d.resolvedAt?.toISOString() ?? null,
    })),
    statusChanges: statusRows.map(({ at, changes, by }) => {
      const c = changes as { status: [string | null, string]; reason?: [unknown, unknown] | string };
      const reason = Array.isArray(c.reason) ? c.reason[1] : c.reason;
      return { at: at.toISOString(), from: c.status[0] ?? null, to: String(c.status[1]), reason: typeof reason === 'string' ? reason : null, by };
    }),
  };
}

async function nameOf(db: DbOrTx, userId: string | null) {
  if (!userId) return null;
  const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, userId));
  return u?.name ?? null;
}
