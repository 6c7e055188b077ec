import { eq, inArray, sql, type SQL } from 'drizzle-orm';
import { continuousKm, inServiceOdometer } from './odometer-anchor';
import type { Db, Tx } from '../db/client';
import { auditLog, bikes, defects, odometerReadings, sites } from '../db/schema';
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
import { tellSiteManagers } from '../mail/site-managers';
import { applyDue, computeAll, recomputeBike } from './due';
import { loadDueInputs } from './due-data';

const day = (iso: string) => new Date(`${iso}T00:00:00Z`).toLocaleDateString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
const fmt = (v: number, unit: string) => `${new Intl.NumberFormat('en-GB', { maximumFractionDigits: 1 }).format(v)} ${unit}`;

type LockedBike = typeof bikes.$inferSelect;

/**
 * Judges a reading against what came before (see readingContext): the km on the continuous scale,
 * or an HttpError that says what is wrong and how to put it right.
 */
function judgeReading(bike: LockedBike, input: CheckIn, date: string, today: string, ctx: Awaited<ReturnType<typeof readingContext>>) {
  const { latest, prior, reset } = ctx;
  if (latest && date < latest.date)
    throw conflict(`The last check-in is dated ${day(latest.date)}; a reading cannot be dated before it.`, [{ path: 'date', message: `Before ${day(latest.date)}.` }]);
  // Judged on the continuous km scale against the highest reading of the days before: readings of
  // one day may arrive in any order (two counters, a late entry), and the highest stays current.
  const odometer = reset ?? inServiceOdometer(bike);
  const odometerKm = input.reset ? (latest?.odometerKm ?? odometer.startCumulativeKm) : continuousKm(input.odometer, bike.odometerUnit, odometer);
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
  return odometerKm;
}

/** Locks bikes' rows (in id order, so two writers never wait on each other in a circle) with their site's time zone. */
async function lockBikes(tx: Tx, ids: string[]) {
  return tx
    .select({ bike: bikes, timeZone: sites.timeZone })
    .from(bikes)
    .innerJoin(sites, eq(sites.id, bikes.siteId))
    .where(inArray(bikes.id, ids))
    .orderBy(bikes.id)
    .for('update', { of: bikes });
}

/** Why this person cannot check this bike in, or null: not theirs to see, or retired. */
function refusal(user: SessionUser, row: Awaited<ReturnType<typeof lockBikes>>[number] | undefined) {
  if (!row || !canSeeSite(user, row.bike.siteId)) return notFound('That bike');
  if (row.bike.status === 'retired') return conflict('This bike is retired. A manager can bring it back before it is checked in.');
  return null;
}

const checkInRow = (user: SessionUser, bike: LockedBike, input: CheckIn, date: string, odometerKm: number, now: Date) => ({
  bikeId: bike.id, date, value: input.odometer, unit: bike.odometerUnit, odometerKm, reset: !!input.reset, source: 'check-in' as const, recordedBy: user.id, createdAt: now,
});
const checkInAudit = (user: SessionUser, bike: LockedBike, input: CheckIn, date: string) => ({
  userId: user.id, action: input.reset ? 'odometer-replaced' : 'check-in', entity: 'bike', entityId: bike.id, changes: { odometer: input.odometer, unit: bike.odometerUnit, date },
});

/** Records a check-in: validates the reading against the last one, stores it, reports a defect, recomputes the bike's dues. */
export async function recordCheckIn(db: Db, user: SessionUser, bikeId: string, input: CheckIn, now: Date) {
  if (input.reset && user.role === 'desk')
    throw forbidden('Only a technician or a manager can record a replaced odometer. Ask one to enter this reading.');
  return db.transaction(async (tx) => {
    // Lock the bike's row so concurrent check-ins of one bike are judged one after the other.
    const [row] = await lockBikes(tx, [bikeId]);
    const refused = refusal(user, row);
    if (refused) throw refused;
    const bike = row.bike;
    const today = todayInZone(row.timeZone, now);
    const date = input.date ?? today;
    const odometerKm = judgeReading(bike, input, date, today, await readingContext(tx, bikeId, date));

    const [reading] = await tx.insert(odometerReadings).values(checkInRow(user, bike, input, date, odometerKm, now)).returning();
    await audit(tx, checkInAudit(user, bike, input, date));

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
        await tellSiteManagers(
          tx,
          {
            siteId: bike.siteId,
            subject: `${bike.fleetNumber} grounded: ${input.defect.category} defect`,
            text: `${user.name} reported a safety defect on ${bike.fleetNumber} at check-in on ${date}:\n\n${input.defect.text}\n\nThe bike is out of service until a technician or manager returns it to service.`,
            key: `defect:${d.id}`,
          },
          now,
        );
        grounded = true;
      }
    }
    const { report, computed } = await recomputeBike(tx, bikeId, now);
    return { reading, grounded, defectId, report, computed };
  });
}

type Reading = { date: string; odometerKm: number; value: number; unit: OdometerUnit };
type ReadingContext = { latest: Reading | null; prior: Reading | null; reset: OdometerSegment | null };

/**
 * What a new reading is judged against, for any number of (bike, date) pairs in one statement: the
 * latest check-in, the highest reading of the days before the date, and the odometer fitted now
 * (the latest replacement, if any).
 */
async function readingContexts(tx: Tx, pairs: { bikeId: string; date: string }[]): Promise<Map<string, ReadingContext>> {
  const out = new Map<string, ReadingContext>();
  if (!pairs.length) return out;
  const pick = (where: SQL, order: SQL) =>
    sql`(select json_build_object('date', r.date, 'odometerKm', r.odometer_km, 'value', r.value, 'unit', r.unit)
           from odometer_readings r where r.bike_id = x.bike_id and ${where} order by ${order} limit 1)`;
  const rows = await jsonTuples<[string, Reading | null, Reading | null, Reading | null]>(
    tx,
    sql`select json_build_array(x.bike_id,
          ${pick(sql`true`, sql`r.date desc, r.odometer_km desc, r.created_at desc`)},
          ${pick(sql`r.date < x.day`, sql`r.odometer_km desc`)},
          ${pick(sql`r.reset`, sql`r.odometer_km desc`)}) as a
        from jsonb_to_recordset(${JSON.stringify(pairs.map((p) => ({ bike_id: p.bikeId, day: p.date })))}::jsonb) as x(bike_id uuid, day date)`,
  );
  for (const [bikeId, latest, prior, replaced] of rows) {
    const reset: OdometerSegment | null = replaced ? { startCumulativeKm: replaced.odometerKm, startValue: replaced.value, unit: replaced.unit, startDate: replaced.date } : null;
    out.set(bikeId, { latest, prior, reset });
  }
  return out;
}

const readingContext = async (tx: Tx, bikeId: string, date: string) => (await readingContexts(tx, [{ bikeId, date }])).get(bikeId)!;

export interface CheckInJob {
  user: SessionUser;
  bikeId: string;
  input: CheckIn;
}
export type CheckInOutcome = { ok: true; result: Awaited<ReturnType<typeof recordCheckIn>> } | { ok: false; error: unknown };

/** Check-ins the batched path takes: one reading of the odometer fitted, nothing else to record. */
export const batchable = (input: CheckIn) => !input.defect && !input.reset;

/**
 * Plain check-ins of different bikes in one transaction, judged exactly as one at a time (each bike
 * appears once), with one recompute for all: a busy counter's readings cost a few statements
 * together instead of a dozen each. A reading refused stays refused on its own; the others are kept.
 */
export async function recordCheckIns(db: Db, jobs: CheckInJob[], now: Date): Promise<CheckInOutcome[]> {
  if (new Set(jobs.map((j) => j.bikeId)).size !== jobs.length) throw new Error('A batch of check-ins takes each bike once.');
  if (jobs.some((j) => !batchable(j.input))) throw new Error('Defects and replaced odometers are recorded one at a time.');
  return db.transaction(async (tx) => {
    const locked = new Map((await lockBikes(tx, jobs.map((j) => j.bikeId))).map((r) => [r.bike.id, r]));
    const outcomes: CheckInOutcome[] = [];
    const accepted: { i: number; job: CheckInJob; bike: LockedBike; date: string; odometerKm: number }[] = [];
    const dated: { i: number; job: CheckInJob; bike: LockedBike; date: string; today: string }[] = [];
    for (const [i, job] of jobs.entries()) {
      const row = locked.get(job.bikeId);
      const refused = refusal(job.user, row);
      if (refused || !row) outcomes[i] = { ok: false, error: refused };
      else {
        const today = todayInZone(row.timeZone, now);
        dated.push({ i, job, bike: row.bike, date: job.input.date ?? today, today });
      }
    }
    const contexts = await readingContexts(tx, dated.map((d) => ({ bikeId: d.bike.id, date: d.date })));
    for (const d of dated) {
      try {
        accepted.push({ ...d, odometerKm: judgeReading(d.bike, d.job.input, d.date, d.today, contexts.get(d.bike.id)!) });
      } catch (error) {
        outcomes[d.i] = { ok: false, error };
      }
    }
    if (!accepted.length) return outcomes;
    const readings = await tx.insert(odometerReadings).values(accepted.map((a) => checkInRow(a.job.user, a.bike, a.job.input, a.date, a.odometerKm, now))).returning();
    await tx.insert(auditLog).values(accepted.map((a) => checkInAudit(a.job.user, a.bike, a.job.input, a.date)));
    const byBike = new Map(readings.map((r) => [r.bikeId, r]));
    const computed = computeAll(await loadDueInputs(tx, now, accepted.map((a) => a.bike.id)));
    const report = await applyDue(tx, computed, now);
    for (const a of accepted) {
      outcomes[a.i] = { ok: true, result: { reading: byBike.get(a.bike.id)!, grounded: false, defectId: null, report, computed: computed.filter((c) => c.bikeId === a.bike.id) } };
    }
    return outcomes;
  });
}

