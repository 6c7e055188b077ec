import { and, eq } from 'drizzle-orm';
import type { Db, DbOrTx } from '../db/client';
import { sites, timeOff, userSites, users, workPatterns } from '../db/schema';
import { canSeeSite } from '../../shared/domain/policies';
import { daysBetween, formatInZone, startOfDayInZone } from '../../shared/domain/dates';
import { checkPatternRule, firstClash, minutesOf, patternInWords } from '../../shared/domain/shifts';
import { MAX_TIME_OFF_DAYS, type TimeOff, type TimeOffCreate, type WorkPattern, type WorkPatternCreate, type WorkPatternPatch } from '../../shared/schemas/capacity';
import type { SessionUser } from '../../shared/schemas/auth';
import { audit, diff } from '../audit';
import { badRequest, conflict, forbidden, notFound } from '../http-error';
import { replanAfter } from './replan';
import { toPattern, toTimeOff } from './capacity';

// Technicians' working patterns and time off. A manager sees and changes those of the technicians at
// their own sites; a technician may add and remove their own time off.

async function technicianAt(tx: DbOrTx, userId: string, siteId: string) {
  const [row] = await tx
    .select({ id: users.id, name: users.name, role: users.role, disabled: users.disabled })
    .from(users)
    .innerJoin(userSites, and(eq(userSites.userId, users.id), eq(userSites.siteId, siteId)))
    .where(eq(users.id, userId));
  if (!row) throw badRequest('That person does not work at this site. Choose a technician of this site, or add the site to their account first.', [{ path: 'userId', message: 'Not at this site.' }]);
  if (row.role !== 'technician') throw badRequest(`${row.name} is not a technician; working patterns are for technicians.`, [{ path: 'userId', message: 'Not a technician.' }]);
  return row;
}

type Draft = { rrule: string; startsOn: string; endsOn: string | null; startTime: string; endTime: string };

/** Checks a pattern's rule, times and dates, and that it does not overlap another pattern of the same person. */
async function checkPattern(tx: DbOrTx, userId: string, name: string, timeZone: string, draft: Draft, exceptId?: string): Promise<Draft> {
  const rule = checkPatternRule(draft.rrule);
  if (!rule.ok) throw badRequest(rule.message, [{ path: 'rrule', message: rule.message }]);
  if ((minutesOf(draft.endTime) ?? 0) <= (minutesOf(draft.startTime) ?? 0))
    throw badRequest('The end time must be after the start time, e.g. 08:00 to 16:30.', [{ path: 'endTime', message: 'Not after the start time.' }]);
  if (draft.endsOn && draft.endsOn < draft.startsOn)
    throw badRequest('The last day is before the first day. Give an end date on or after the start date, or none.', [{ path: 'endsOn', message: 'Before the first day.' }]);
  const next = { ...draft, rrule: rule.rule };
  const others = (await tx.select().from(workPatterns).where(eq(workPatterns.userId, userId))).filter((p) => p.id !== exceptId);
  for (const o of others) {
    const day = firstClash(next, o, timeZone);
    if (day)
      throw conflict(
        `This overlaps ${name}’s pattern “${patternInWords(o.rrule, o.startTime, o.endTime)}” on ${formatInZone(startOfDayInZone(day, timeZone) + 12 * 3_600_000, timeZone, 'EEE d MMM yyyy')}. Change the days or times, or end the other pattern first.`,
        [{ path: 'rrule', message: 'Overlaps another pattern.' }],
      );
  }
  return next;
}

async function zoneOf(tx: DbOrTx, siteId: string) {
  const [s] = await tx.select({ timeZone: sites.timeZone }).from(sites).where(eq(sites.id, siteId));
  if (!s) throw notFound('That site');
  return s.timeZone;
}

export async function createPattern(db: Db, user: SessionUser, input: WorkPatternCreate, now: Date): Promise<{ pattern: WorkPattern }> {
  if (!canSeeSite(user, input.siteId)) throw notFound('That site');
  const row = await db.transaction(async (tx) => {
    const timeZone = await zoneOf(tx, input.siteId);
    const tech = await technicianAt(tx, input.userId, input.siteId);
    // Lock the person's row so two patterns written at once are checked against each other.
    await tx.select({ id: users.id }).from(users).where(eq(users.id, tech.id)).for('update');
    const draft = await checkPattern(tx, tech.id, tech.name, timeZone, { rrule: input.rrule, startsOn: input.startsOn, endsOn: input.endsOn ?? null, startTime: input.startTime, endTime: input.endTime });
    const [created] = await tx.insert(workPatterns).values({ userId: tech.id, siteId: input.siteId, ...draft, label: input.label ?? null }).returning();
    await audit(tx, { userId: user.id, action: 'create', entity: 'work_pattern', entityId: created.id, changes: { ...input, rrule: draft.rrule } });
    return created;
  });
  await replanAfter(db, { siteIds: [input.siteId], why: 'working pattern added' }, now);
  return { pattern: toPattern(row) };
}

async function patternOf(tx: DbOrTx, user: SessionUser, id: string) {
  const [p] = await tx.select().from(workPatterns).where(eq(workPatterns.id, id));
  if (!p || !canSeeSite(user, p.siteId)) throw notFound('That working pattern');
  await tx.select({ id: users.id }).from(users).where(eq(users.id, p.userId)).for('update');
  return p;
}

export async function patchPattern(db: Db, user: SessionUser, id: string, patch: WorkPatternPatch, now: Date): Promise<{ pattern: WorkPattern }> {
  const row = await db.transaction(async (tx) => {
    const before = await patternOf(tx, user, id);
    const [tech] = await tx.select({ name: users.name }).from(users).where(eq(users.id, before.userId));
    const draft = await checkPattern(
      tx, before.userId, tech?.name ?? 'This technician', await zoneOf(tx, before.siteId),
      {
        rrule: patch.rrule ?? before.rrule, startsOn: patch.startsOn ?? before.startsOn, endsOn: patch.endsOn === undefined ? before.endsOn : patch.endsOn,
        startTime: patch.startTime ?? before.startTime, endTime: patch.endTime ?? before.endTime,
      },
      id,
    );
    const next = { ...draft, label: patch.label === undefined ? before.label : patch.label };
    const [after] = await tx.update(workPatterns).set(next).where(eq(workPatterns.id, id)).returning();
    await audit(tx, { userId: user.id, action: 'update', entity: 'work_pattern', entityId: id, changes: diff(before, next) });
    return after;
  });
  await replanAfter(db, { siteIds: [row.siteId], why: 'working pattern changed' }, now);
  return { pattern: toPattern(row) };
}

export async function deletePattern(db: Db, user: SessionUser, id: string, now: Date): Promise<{ deleted: string }> {
  const siteId = await db.transaction(async (tx) => {
    const p = await patternOf(tx, user, id);
    await tx.delete(workPatterns).where(eq(workPatterns.id, id));
    await audit(tx, { userId: user.id, action: 'delete', entity: 'work_pattern', entityId: id, changes: toPattern(p) });
    return p.siteId;
  });
  await replanAfter(db, { siteIds: [siteId], why: 'working pattern removed' }, now);
  return { deleted: id };
}

// ── Time off ─────────────────────────────────────────────────────────────────
/** The technician's sites that the caller also works at; a technician may act for themself only. */
async function sharedSites(tx: DbOrTx, user: SessionUser, userId: string, what: string) {
  const [person] = await tx.select({ id: users.id, role: users.role, name: users.name }).from(users).where(eq(users.id, userId));
  const theirs = person ? (await tx.select({ siteId: userSites.siteId }).from(userSites).where(eq(userSites.userId, userId))).map((r) => r.siteId) : [];
  const shared = theirs.filter((s) => canSeeSite(user, s));
  if (!person || (!shared.length && person.id !== user.id)) throw notFound(what);
  if (user.role === 'technician' && person.id !== user.id) throw forbidden('A technician may add and remove only their own time off. Ask a manager for anyone else’s.');
  if (person.role !== 'technician') throw badRequest(`${person.name} is not a technician; time off here is for technicians.`, [{ path: 'userId', message: 'Not a technician.' }]);
  return { person, siteIds: shared };
}

export async function createTimeOff(db: Db, user: SessionUser, input: TimeOffCreate, now: Date): Promise<{ timeOff: TimeOff }> {
  if (input.lastDay < input.firstDay)
    throw badRequest('The last day is before the first day. Give a last day on or after the first.', [{ path: 'lastDay', message: 'Before the first day.' }]);
  if (daysBetween(input.firstDay, input.lastDay) + 1 > MAX_TIME_OFF_DAYS)
    throw badRequest(`Time off may be at most ${MAX_TIME_OFF_DAYS} days at once. Split a longer absence into parts.`, [{ path: 'lastDay', message: 'Too long.' }]);
  const { row, siteIds } = await db.transaction(async (tx) => {
    const { siteIds: shared } = await sharedSites(tx, user, input.userId, 'That person');
    const [created] = await tx.insert(timeOff).values({ userId: input.userId, firstDay: input.firstDay, lastDay: input.lastDay, reason: input.reason ?? null, createdBy: user.id }).returning();
    await audit(tx, { userId: user.id, action: 'create', entity: 'time_off', entityId: created.id, changes: input });
    return { row: created, siteIds: shared };
  });
  await replanAfter(db, { siteIds, why: 'time off added' }, now);
  return { timeOff: toTimeOff(row) };
}

export async function deleteTimeOff(db: Db, user: SessionUser, id: string, now: Date): Promise<{ deleted: string }> {
  const siteIds = await db.transaction(async (tx) => {
    const [o] = await tx.select().from(timeOff).where(eq(timeOff.id, id));
    if (!o) throw notFound('That time off');
    const { siteIds: shared } = await sharedSites(tx, user, o.userId, 'That time off');
    await tx.delete(timeOff).where(eq(timeOff.id, id));
    await audit(tx, { userId: user.id, action: 'delete', entity: 'time_off', entityId: id, changes: toTimeOff(o) });
    return shared;
  });
  await replanAfter(db, { siteIds, why: 'time off removed' }, now);
  return { deleted: id };
}
