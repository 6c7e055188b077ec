import { and, eq, gt, inArray, isNotNull, lt, or } from 'drizzle-orm';
import type { Db, DbOrTx } from '../db/client';
import { bikeModels, bikes, bookingFeeds, bookings, sites } from '../db/schema';
import { bookingOccurrences, DAY_MS, ruleText, type BookingRow } from '../../shared/domain/bookings';
import { addDaysIso, startOfDayInZone, todayInZone } from '../../shared/domain/dates';
import { canSeeSite } from '../../shared/domain/policies';
import { MAX_RANGE_DAYS, type Booking, type BookingCreate, type BookingList, type BookingListQuery } from '../../shared/schemas/bookings';
import type { SessionUser } from '../../shared/schemas/auth';
import { audit } from '../audit';
import { badRequest, conflict, notFound } from '../http-error';
import { loadRefs, refProblems } from './bookings-refs';
import { replanAfter } from './replan';

const DEFAULT_DAYS = 21;

/** A day "YYYY-MM-DD" begins at the site's midnight; a time with an offset is that instant. */
const instantOf = (v: string, timeZone: string) => (v.length === 10 ? startOfDayInZone(v, timeZone) : Date.parse(v));

type Joined = {
  b: typeof bookings.$inferSelect;
  siteName: string;
  timeZone: string;
  fleetNumber: string | null;
  bikeModelId: string | null;
  modelName: string | null;
  bikeModelName: string | null;
  feedName: string | null;
};

async function joined(db: DbOrTx, where: ReturnType<typeof and>): Promise<Joined[]> {
  const rows = await db
    .select({
      b: bookings, siteName: sites.name, timeZone: sites.timeZone, fleetNumber: bikes.fleetNumber, bikeModelId: bikes.modelId,
      modelName: bikeModels.name, feedName: bookingFeeds.name,
    })
    .from(bookings)
    .innerJoin(sites, eq(sites.id, bookings.siteId))
    .leftJoin(bikes, eq(bikes.id, bookings.bikeId))
    .leftJoin(bikeModels, eq(bikeModels.id, bookings.modelId))
    .leftJoin(bookingFeeds, eq(bookingFeeds.id, bookings.feedId))
    .where(where);
  const bikeModelIds = [...new Set(rows.flatMap((r) => (r.bikeModelId ? [r.bikeModelId] : [])))];
  const names = bikeModelIds.length ? await db.select({ id: bikeModels.id, name: bikeModels.name }).from(bikeModels).where(inArray(bikeModels.id, bikeModelIds)) : [];
  const nameOf = new Map(names.map((m) => [m.id, m.name]));
  return rows.map((r) => ({ ...r, bikeModelName: r.bikeModelId ? (nameOf.get(r.bikeModelId) ?? null) : null }));
}

const rowOf = (b: typeof bookings.$inferSelect): BookingRow => ({
  id: b.id, siteId: b.siteId, kind: b.kind, bikeId: b.bikeId, modelId: b.modelId, quantity: b.quantity, startAt: b.startAt, endAt: b.endAt, rrule: b.rrule, title: b.title,
});

function toBooking(r: Joined, from: number, to: number): Booking {
  const occ = bookingOccurrences([rowOf(r.b)], { [r.b.siteId]: r.timeZone }, from, to);
  return {
    id: r.b.id, siteId: r.b.siteId, siteName: r.siteName, timeZone: r.timeZone, kind: r.b.kind, bikeId: r.b.bikeId, fleetNumber: r.fleetNumber,
    modelId: r.b.modelId ?? r.bikeModelId, modelName: r.modelName ?? r.bikeModelName ?? '', quantity: r.b.quantity,
    startAt: r.b.startAt.toISOString(), endAt: r.b.endAt.toISOString(), rrule: r.b.rrule, ruleText: ruleText(r.b.rrule), title: r.b.title,
    source: r.b.source, feedId: r.b.feedId, feedName: r.feedName,
    occurrences: occ.map((o) => ({ start: new Date(o.start).toISOString(), end: new Date(o.end).toISOString() })),
  };
}

/** The bookings at the person's sites with an occurrence in the range (default: today and the next three weeks). */
export async function listBookings(db: Db, user: SessionUser, q: BookingListQuery, now: Date): Promise<BookingList> {
  if (q.site && !canSeeSite(user, q.site)) throw notFound('That site');
  const siteIds = q.site ? [q.site] : [...user.siteIds];
  const zoneRows = siteIds.length ? await db.select({ id: sites.id, timeZone: sites.timeZone }).from(sites).where(inArray(sites.id, siteIds)) : [];
  if (q.site && !zoneRows.length) throw notFound('That site');
  const zone = zoneRows[0]?.timeZone ?? 'Europe/London';
  const today = todayInZone(zone, now);
  const from = instantOf(q.from ?? today, zone);
  const to = q.to ? instantOf(q.to, zone) + (q.to.length === 10 ? DAY_MS : 0) : startOfDayInZone(addDaysIso(today, DEFAULT_DAYS), zone);
  if (!(to > from)) throw badRequest('The range ends before it starts. Give a “to” after “from”.', [{ path: 'query.to', message: 'Before “from”.' }]);
  if (to - from > MAX_RANGE_DAYS * DAY_MS) throw badRequest(`Ask for at most ${MAX_RANGE_DAYS} days at once.`, [{ path: 'query.to', message: 'Range too long.' }]);
  if (!zoneRows.length) return { from: new Date(from).toISOString(), to: new Date(to).toISOString(), items: [] };
  const rows = await joined(
    db,
    and(inArray(bookings.siteId, zoneRows.map((s) => s.id)), lt(bookings.startAt, new Date(to)), or(isNotNull(bookings.rrule), gt(bookings.endAt, new Date(from)))),
  );
  const items = rows.map((r) => toBooking(r, from, to)).filter((b) => b.occurrences.length > 0);
  items.sort((a, b) => a.occurrences[0].start.localeCompare(b.occurrences[0].start) || a.id.localeCompare(b.id));
  return { from: new Date(from).toISOString(), to: new Date(to).toISOString(), items };
}

export async function bookingById(db: DbOrTx, user: SessionUser, id: string, now: Date): Promise<Booking> {
  const [r] = await joined(db, and(eq(bookings.id, id)));
  if (!r || !canSeeSite(user, r.b.siteId)) throw notFound('That booking');
  const from = r.b.startAt.getTime();
  return toBooking(r, Math.min(from, now.getTime()), Math.max(from, now.getTime()) + 60 * DAY_MS);
}

export async function createBooking(db: Db, user: SessionUser, input: BookingCreate, now: Date): Promise<Booking> {
  if (!canSeeSite(user, input.siteId)) throw notFound('That site');
  const id = await db.transaction(async (tx) => {
    const refs = await loadRefs(tx, user.siteIds);
    if (!refs.sites.has(input.siteId)) throw notFound('That site');
    const draft = { siteId: input.siteId, bikeId: input.bikeId ?? null, modelId: input.modelId ?? null, quantity: input.quantity, start: Date.parse(input.start), end: Date.parse(input.end) };
    const problems = refProblems(refs, draft);
    if (problems.length) throw badRequest(problems.map((p) => p.message).join(' '), problems.map((p) => ({ path: p.field, message: p.message })));
    const [row] = await tx
      .insert(bookings)
      .values({
        siteId: draft.siteId, kind: input.kind, bikeId: draft.bikeId, modelId: draft.modelId, quantity: draft.quantity,
        startAt: new Date(draft.start), endAt: new Date(draft.end), rrule: input.rrule ?? null, title: input.title, source: 'manual', createdBy: user.id, createdAt: now, updatedAt: now,
      })
      .returning({ id: bookings.id });
    await audit(tx, { userId: user.id, action: 'create', entity: 'booking', entityId: row.id, changes: { ...input } });
    return row.id;
  });
  await replanAfter(db, { siteIds: [input.siteId], bikeIds: input.bikeId ? [input.bikeId] : undefined, why: 'booking added' }, now);
  return bookingById(db, user, id, now);
}

export async function deleteBooking(db: Db, user: SessionUser, id: string, now: Date): Promise<{ deleted: string }> {
  const gone = await db.transaction(async (tx) => {
    const [r] = await tx.select({ b: bookings, feedName: bookingFeeds.name }).from(bookings).leftJoin(bookingFeeds, eq(bookingFeeds.id, bookings.feedId)).where(eq(bookings.id, id)).for('update', { of: bookings });
    if (!r || !canSeeSite(user, r.b.siteId)) throw notFound('That booking');
    if (r.b.source === 'feed') throw conflict(`This booking comes from the feed '${r.feedName ?? 'removed'}'; change it in that calendar.`);
    await tx.delete(bookings).where(eq(bookings.id, id));
    await audit(tx, { userId: user.id, action: 'delete', entity: 'booking', entityId: id, changes: rowOf(r.b) });
    return r.b;
  });
  await replanAfter(db, { siteIds: [gone.siteId], bikeIds: gone.bikeId ? [gone.bikeId] : undefined, why: 'booking removed' }, now);
  return { deleted: id };
}
