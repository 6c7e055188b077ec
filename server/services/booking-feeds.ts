import { and, desc, eq, inArray, ne } from 'drizzle-orm';
import type { Db } from '../db/client';
import { auditLog, bikeModels, bikes, bookingFeeds, bookings, sites } from '../db/schema';
import { DAY_MS } from '../../shared/domain/bookings';
import { formatInZone, todayInZone } from '../../shared/domain/dates';
import { canSeeSite } from '../../shared/domain/policies';
import type { Feed, FeedCreate, SyncResult } from '../../shared/schemas/bookings';
import type { SessionUser } from '../../shared/schemas/auth';
import { audit } from '../audit';
import { badRequest, notFound } from '../http-error';
import { fetchCalendar, FeedFetchError, type FetchLimits } from './booking-feed-fetch';
import { FeedParseError, needOf, parseFeed } from './booking-feed-ical';
import { replanAfter } from './replan';

/** A good copy covers yesterday to 60 days ahead: what the planner's horizon can reach. */
export const FEED_PAST_DAYS = 1;
export const FEED_AHEAD_DAYS = 60;

type FeedRow = typeof bookingFeeds.$inferSelect;
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function when(at: Date, timeZone: string, now: Date) {
  return todayInZone(timeZone, at) === todayInZone(timeZone, now) ? formatInZone(at, timeZone, 'HH:mm') : formatInZone(at, timeZone, 'd MMM HH:mm');
}

/** The feed's state in words, in the site's time. */
export function feedStatus(f: Pick<FeedRow, 'lastAttemptAt' | 'lastGoodAt' | 'lastError' | 'eventCount'>, skipped: number, timeZone: string, now: Date): string {
  const copy = f.lastGoodAt ? `the copy from ${when(f.lastGoodAt, timeZone, now)}, ${plural(f.eventCount, 'event')}` : null;
  const skippedText = skipped ? ` ${plural(skipped, 'event')} skipped: no bike or model named.` : '';
  if (!f.lastAttemptAt) return 'Not loaded yet.';
  if (f.lastError) return `Could not load at ${when(f.lastAttemptAt, timeZone, now)}: ${f.lastError}. ${copy ? `Showing ${copy}.` : 'No copy has loaded yet, so it adds no bookings.'}`;
  return `Loaded at ${when(f.lastGoodAt ?? f.lastAttemptAt, timeZone, now)}: ${plural(f.eventCount, 'event')}.${skippedText}`;
}

async function skippedOf(db: Db, ids: string[]) {
  if (!ids.length) return new Map<string, number>();
  const rows = await db
    .selectDistinctOn([auditLog.entityId], { id: auditLog.entityId, changes: auditLog.changes })
    .from(auditLog)
    .where(and(eq(auditLog.entity, 'booking_feed'), eq(auditLog.action, 'sync'), inArray(auditLog.entityId, ids)))
    .orderBy(auditLog.entityId, desc(auditLog.id));
  return new Map(rows.map((r) => [r.id!, Number((r.changes as { skipped?: number } | null)?.skipped ?? 0)]));
}

export async function listFeeds(db: Db, user: SessionUser, now: Date, ids?: string[]): Promise<Feed[]> {
  if (!user.siteIds.length) return [];
  const rows = await db
    .select({ f: bookingFeeds, siteName: sites.name, timeZone: sites.timeZone, modelName: bikeModels.name })
    .from(bookingFeeds)
    .innerJoin(sites, eq(sites.id, bookingFeeds.siteId))
    .leftJoin(bikeModels, eq(bikeModels.id, bookingFeeds.defaultModelId))
    .where(and(inArray(bookingFeeds.siteId, [...user.siteIds]), ids ? inArray(bookingFeeds.id, ids) : undefined))
    .orderBy(sites.name, bookingFeeds.name);
  const skipped = await skippedOf(db, rows.map((r) => r.f.id));
  return rows.map(({ f, siteName, timeZone, modelName }) => ({
    id: f.id, siteId: f.siteId, siteName, name: f.name, url: f.url, kind: f.kind, defaultModelId: f.defaultModelId, defaultModelName: modelName,
    lastAttemptAt: f.lastAttemptAt?.toISOString() ?? null, lastGoodAt: f.lastGoodAt?.toISOString() ?? null, lastError: f.lastError,
    eventCount: f.eventCount, skipped: f.lastGoodAt ? (skipped.get(f.id) ?? 0) : 0,
    status: feedStatus(f, f.lastGoodAt ? (skipped.get(f.id) ?? 0) : 0, timeZone, now),
  }));
}

/** Loads one feed now. A good copy replaces the feed's bookings in one transaction; a failure keeps the last good copy. */
export async function syncFeed(db: Db, feedId: string, now: Date, limits?: FetchLimits): Promise<SyncResult> {
  const [row] = await db.select({ f: bookingFeeds, timeZone: sites.timeZone }).from(bookingFeeds).innerJoin(sites, eq(sites.id, bookingFeeds.siteId)).where(eq(bookingFeeds.id, feedId));
  if (!row) throw notFound('That calendar feed');
  const { f, timeZone } = row;
  const window = { from: now.getTime() - FEED_PAST_DAYS * DAY_MS, to: now.getTime() + FEED_AHEAD_DAYS * DAY_MS };
  let parsed: ReturnType<typeof parseFeed>;
  try {
    parsed = parseFeed(await fetchCalendar(f.url, limits), window, timeZone);
  } catch (e) {
    if (!(e instanceof FeedFetchError || e instanceof FeedParseError)) throw e;
    const error = e.message.replace(/\.$/, '');
    await db.update(bookingFeeds).set({ lastAttemptAt: now, lastError: error }).where(eq(bookingFeeds.id, f.id));
    return { ok: false, events: f.eventCount, skipped: 0, error, message: feedStatus({ ...f, lastAttemptAt: now, lastError: error }, 0, timeZone, now) };
  }

  const result = await db.transaction(async (tx) => {
    const siteBikes = await tx.select({ id: bikes.id, fleetNumber: bikes.fleetNumber, modelId: bikes.modelId }).from(bikes).where(and(eq(bikes.siteId, f.siteId), ne(bikes.status, 'retired')));
    const models = await tx.select({ id: bikeModels.id, name: bikeModels.name }).from(bikeModels);
    const counts = new Map<string, number>();
    for (const b of siteBikes) counts.set(b.modelId, (counts.get(b.modelId) ?? 0) + 1);
    const targets = { bikes: siteBikes, models, defaultModelId: f.defaultModelId, countOf: (m: string) => counts.get(m) ?? 0 };
    const values: (typeof bookings.$inferInsert)[] = [];
    let skipped = 0;
    let capped = 0;
    let events = 0;
    for (const o of parsed.occurrences) {
      const need = needOf(o, targets);
      if (!need) {
        skipped++;
        continue;
      }
      events++;
      const base = { siteId: f.siteId, kind: f.kind, startAt: new Date(o.start), endAt: new Date(o.end), title: o.summary.slice(0, 120), source: 'feed' as const, feedId: f.id, externalUid: `${o.uid}/${new Date(o.start).toISOString()}`, createdAt: now, updatedAt: now };
      if ('bikeIds' in need) for (const bikeId of need.bikeIds) values.push({ ...base, bikeId, quantity: 1 });
      else {
        if (need.capped) capped++;
        values.push({ ...base, modelId: need.modelId, quantity: need.quantity });
      }
    }
    const before = await tx.select({ u: bookings.externalUid, s: bookings.startAt, e: bookings.endAt, b: bookings.bikeId, m: bookings.modelId, q: bookings.quantity }).from(bookings).where(eq(bookings.feedId, f.id));
    const sig = (r: { u: string | null | undefined; s: Date; e: Date; b?: string | null; m?: string | null; q?: number }) => `${r.u}|${r.s.getTime()}|${r.e.getTime()}|${r.b ?? ''}|${r.m ?? ''}|${r.q ?? 1}`;
    const oldSig = before.map(sig).sort().join('\n');
    const newSig = values.map((v) => sig({ u: v.externalUid, s: v.startAt as Date, e: v.endAt as Date, b: v.bikeId, m: v.modelId, q: v.quantity })).sort().join('\n');
    const changed = oldSig !== newSig || !f.lastGoodAt;
    if (changed) {
      await tx.delete(bookings).where(eq(bookings.feedId, f.id));
      for (let i = 0; i < values.length; i += 500) await tx.insert(bookings).values(values.slice(i, i + 500));
    }
    await tx.update(bookingFeeds).set({ lastAttemptAt: now, lastGoodAt: now, lastError: null, eventCount: events }).where(eq(bookingFeeds.id, f.id));
    const [last] = await tx.select({ changes: auditLog.changes }).from(auditLog).where(and(eq(auditLog.entity, 'booking_feed'), eq(auditLog.action, 'sync'), eq(auditLog.entityId, f.id))).orderBy(desc(auditLog.id)).limit(1);
    // The log keeps each different copy, not every quarter-hour's identical one.
    if (changed || (last?.changes as { skipped?: number } | undefined)?.skipped !== skipped)
      await audit(tx, { userId: null, action: 'sync', entity: 'booking_feed', entityId: f.id, changes: { events, rows: values.length, skipped, capped, unreadable: parsed.unreadable.length } });
    return { events, skipped, capped, changed, bikeIds: [...new Set(values.flatMap((v) => (v.bikeId ? [v.bikeId] : [])))] };
  });
  if (result.changed) await replanAfter(db, { siteIds: [f.siteId], why: `calendar feed ${f.name} loaded` }, now);
  const extra = [
    result.capped ? ` ${plural(result.capped, 'event')} asked for more bikes of a model than the site has: booked all of them.` : '',
    parsed.unreadable.length ? ` ${plural(parsed.unreadable.length, 'event')} could not be read (${[...new Set(parsed.unreadable.map((u) => u.reason))].join('; ')}).` : '',
  ].join('');
  return {
    ok: true, events: result.events, skipped: result.skipped, error: null,
    message: feedStatus({ lastAttemptAt: now, lastGoodAt: now, lastError: null, eventCount: result.events }, result.skipped, timeZone, now) + extra,
  };
}

export async function createFeed(db: Db, user: SessionUser, input: FeedCreate, now: Date, limits?: FetchLimits) {
  if (!canSeeSite(user, input.siteId)) throw notFound('That site');
  const id = await db.transaction(async (tx) => {
    const [site] = await tx.select({ id: sites.id }).from(sites).where(eq(sites.id, input.siteId));
    if (!site) throw notFound('That site');
    if (input.defaultModelId) {
      const [m] = await tx.select({ id: bikeModels.id }).from(bikeModels).where(eq(bikeModels.id, input.defaultModelId));
      if (!m) throw badRequest('No model has that id. Pick the default model from the list, or leave it empty.', [{ path: 'defaultModelId', message: 'Unknown model.' }]);
    }
    const [row] = await tx
      .insert(bookingFeeds)
      .values({ siteId: input.siteId, name: input.name, url: input.url, kind: input.kind, defaultModelId: input.defaultModelId ?? null, createdBy: user.id, createdAt: now })
      .returning({ id: bookingFeeds.id });
    await audit(tx, { userId: user.id, action: 'create', entity: 'booking_feed', entityId: row.id, changes: { ...input } });
    return row.id;
  });
  const result = await syncFeed(db, id, now, limits);
  const [feed] = await listFeeds(db, user, now, [id]);
  return { feed, result };
}

export async function deleteFeed(db: Db, user: SessionUser, id: string, now: Date) {
  const siteId = await db.transaction(async (tx) => {
    const [f] = await tx.select().from(bookingFeeds).where(eq(bookingFeeds.id, id)).for('update');
    if (!f || !canSeeSite(user, f.siteId)) throw notFound('That calendar feed');
    // Its bookings go with it (the foreign key cascades).
    await tx.delete(bookingFeeds).where(eq(bookingFeeds.id, id));
    await audit(tx, { userId: user.id, action: 'delete', entity: 'booking_feed', entityId: id, changes: { name: f.name, url: f.url } });
    return f.siteId;
  });
  await replanAfter(db, { siteIds: [siteId], why: 'calendar feed removed' }, now);
  return { deleted: id };
}

/** Every feed, one after the other; one failing feed does not stop the others. */
export async function syncAllFeeds(db: Db, now: Date, limits?: FetchLimits) {
  const feeds = await db.select({ id: bookingFeeds.id, name: bookingFeeds.name }).from(bookingFeeds).orderBy(bookingFeeds.name);
  const results: (SyncResult & { feedId: string; name: string })[] = [];
  for (const f of feeds) {
    try {
      results.push({ feedId: f.id, name: f.name, ...(await syncFeed(db, f.id, now, limits)) });
    } catch (e) {
      const error = e instanceof Error ? e.message : String(e);
      results.push({ feedId: f.id, name: f.name, ok: false, events: 0, skipped: 0, error, message: `Could not load: ${error}` });
    }
  }
  return results;
}
