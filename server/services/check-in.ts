import { and, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { continuousKm, inServiceOdometer } from './odometer-anchor';
import type { Db, Tx } from '../db/client';
import { bikes, defects, odometerReadings, sites, userSites, users } from '../db/schema';
import { jsonTuples } from '../db/json-rows';
import type { OdometerSegment } from '../../shared/domain/odometer';
import type { OdometerUnit } from '../../shared/domain/units';
import { validateNextReading } from '../../shared/domain/odometer';
import { todayInZone } from '../../shared/domain/dates';
import type { CheckIn } from '../../shared/schemas/due';
import type { SessionUser } from '../../shared/schemas/auth';
import { canSeeSite } from '../../shared/domain/policies';
import { HttpError, badRequest, conflict, forbidden, notFound } from '../http-error';
import { audit } from '../audit';
import { enqueue } from '../mail/outbox';
import { recomputeBike } from './due';

const day = (iso: string) => new Date(`${iso}T00:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
const fmt = (v: number, unit: string) => `${new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 }).format(v)} ${unit}`;

/** Records a check-in: validates the reading against the last one, stores it, reports a defect, recomputes the bike's dues. */
export async function recordCheckIn(db: Db, user: SessionUser, bikeId: string, input: CheckIn, now: Date) {
  if (input.reset && user.role === 'desk')
    throw forbidden('Only a technician or a manager can record a replaced odometer. Ask one to enter this reading.');
  return db.transaction(async (tx) => {
    // Lock the bike's row so concurrent check-ins of one bike are judged one after the other.
    const [row] = await tx
      .select({ bike: bikes, timeZone: sites.timeZone })
      .from(bikes)
      .innerJoin(sites, eq(sites.id, bikes.siteId))
      .where(eq(bikes.id, bikeId))
      .for('update', { of: bikes });
    if (!row || !canSeeSite(user, row.bike.siteId)) throw notFound('That bike');
    const bike = row.bike;
    if (bike.status === 'retired') throw conflict('This bike is retired. A manager can bring it back before it is checked in.');
    const today = todayInZone(row.timeZone, now);
    const date = input.date ?? today;
    const { latest, prior, reset } = await readingContext(tx, bikeId, date);
    if (latest && date < latest.date)
      throw conflict(`The last check-in is dated ${day(latest.date)}; a reading cannot be dated before it.`, [{ path: 'date', message: `Before ${day(latest.date)}.` }]);
    // Judged on the continuous km scale against the highest reading of the days before: readings of
    // one day may arrive in any order (two counters, a late entry), and the highest stays current.
    const unit = bike.odometerUnit;
    const odometer = reset ?? inServiceOdometer(bike);
    const odometerKm = input.reset ? (latest?.odometerKm ?? odometer.startCumulativeKm) : continuousKm(input.odometer, unit, odometer);
    const check = validateNextReading({
      last: prior ? { date: prior.date, value: prior.odometerKm, unit: 'km' } : null,
      next: { date, value: odometerKm, unit: 'km', reset: input.reset },
      today,
    });
    if (check.kind === 'future_date')
      throw badRequest(`The date is after today (${day(today)}). Enter today's date or an earlier one.`, [{ path: 'date', message: 'In the future.' }]);
    if (check.kind === 'lower_than_last' && prior)
      throw conflict(
        `The odometer cannot go backwards: the last reading was ${fmt(prior.value, prior.unit)} on ${day(prior.date)}. Check the digits. If the odometer was replaced, a technician or manager records it as a new odometer.`,
        [{ path: 'odometer', message: `Lower than the last reading, ${fmt(prior.value, prior.unit)}.` }],
      );
    if (check.kind === 'big_jump' && !input.confirmLargeJump)
      throw new HttpError(
        409,
        'needs_confirmation',
        `That is ${fmt(check.km, 'km')} in ${check.days > 1 ? `${check.days} days` : 'one day'}, more than 1,000 km a day. Check the reading; if it is right, confirm it.`,
        [{ path: 'odometer', message: 'Unusually large distance: confirm to save.' }],
      );

    const [reading] = await tx
      .insert(odometerReadings)
      .values({ bikeId, date, value: input.odometer, unit, odometerKm, reset: !!input.reset, source: 'check-in', recordedBy: user.id, createdAt: now })
      .returning();
    await audit(tx, { userId: user.id, action: input.reset ? 'odometer-replaced' : 'check-in', entity: 'bike', entityId: bikeId, changes: { odometer: input.odometer, unit, date } });

    let grounded = false;
    let defectId: string | null = null;
    if (input.defect) {
      const [d] = await tx
        .insert(defects)
        .values({ bikeId, category: input.defect.category, text: input.defect.text, safetyCritical: input.defect.safetyCritical, reportedBy: user.id, reportedAt: now })
        .returning();
      defectId = d.id;
      await audit(tx, { userId: user.id, action: 'defect', entity: 'bike', entityId: bikeId, changes: { defectId: d.id, ...input.defect } });
      if (input.defect.safetyCritical && bike.status !== 'out_of_service') {
        const reason = `Safety defect reported at check-in (${input.defect.category}): ${input.defect.text}`;
        await tx.update(bikes).set({ status: 'out_of_service', statusReason: reason, updatedAt: now }).where(eq(bikes.id, bikeId));
        await audit(tx, { userId: user.id, action: 'grounded', entity: 'bike', entityId: bikeId, changes: { status: [bike.status, 'out_of_service'], reason } });
        await tellManagers(tx, bike.siteId, `${bike.fleetNumber} grounded: ${input.defect.category} defect`, `${user.name} reported a safety defect on ${bike.fleetNumber} at check-in on ${date}:\n\n${input.defect.text}\n\nThe bike is out of service until a technician or manager returns it to service.`, `defect:${d.id}`, now);
        grounded = true;
      }
    }
    const { report, computed } = await recomputeBike(tx, bikeId, now);
    return { reading, grounded, defectId, report, computed };
  });
}

type Reading = { date: string; odometerKm: number; value: number; unit: OdometerUnit };

/**
 * What a new reading is judged against, in one statement: the latest check-in, the highest reading
 * of the days before `date`, and the odometer fitted now (the latest replacement, if any).
 */
async function readingContext(tx: Tx, bikeId: string, date: string) {
  const pick = (where: SQL, order: SQL) =>
    sql`(select json_build_object('date', r.date, 'odometerKm', r.odometer_km, 'value', r.value, 'unit', r.unit)
           from odometer_readings r where r.bike_id = ${bikeId} and ${where} order by ${order} limit 1)`;
  const [row] = await jsonTuples<[Reading | null, Reading | null, Reading | null]>(
    tx,
    sql`select json_build_array(
          ${pick(sql`true`, sql`r.date desc, r.odometer_km desc, r.created_at desc`)},
          ${pick(sql`r.date < ${date}`, sql`r.odometer_km desc`)},
          ${pick(sql`r.reset`, sql`r.odometer_km desc`)}) as a`,
  );
  const [latest, prior, replaced] = row;
  const reset: OdometerSegment | null = replaced ? { startCumulativeKm: replaced.odometerKm, startValue: replaced.value, unit: replaced.unit, startDate: replaced.date } : null;
  return { latest, prior, reset };
}

async function tellManagers(tx: Tx, siteId: string, subject: string, text: string, key: string, now: Date) {
  const managers = await tx
    .select({ id: users.id, email: users.email })
    .from(users)
    .innerJoin(userSites, eq(userSites.userId, users.id))
    .where(and(eq(userSites.siteId, siteId), inArray(users.role, ['manager']), eq(users.disabled, false)));
  for (const m of managers) {
    const html = `<p>${escapeHtml(text).replace(/\n/g, '<br>')}</p>`;
    await enqueue(tx, { dedupeKey: `${key}:${m.id}`, to: m.email, subject: `Lashline: ${subject}`, text, html }, now);
  }
}

export const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
