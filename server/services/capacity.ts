import { and, asc, eq, gte, inArray, ne, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../db/client';
import { bays, siteHours, sites, timeOff, userSites, users, visits, workPatterns } from '../db/schema';
import { canSeeSite } from '../../shared/domain/policies';
import { formatInZone, startOfDayInZone, todayInZone } from '../../shared/domain/dates';
import { patternInWords } from '../../shared/domain/shifts';
import type { Bay, BayPatch, Capacity, CapacityQuery, CapacitySite, DayHours, TimeOff, WorkPattern } from '../../shared/schemas/capacity';
import type { SessionUser } from '../../shared/schemas/auth';
import { audit } from '../audit';
import { conflict, notFound } from '../http-error';
import { replanAfter } from './replan';

type PatternRow = typeof workPatterns.$inferSelect;

export const toPattern = (p: PatternRow): WorkPattern => ({
  id: p.id, rrule: p.rrule, startsOn: p.startsOn, endsOn: p.endsOn, startTime: p.startTime, endTime: p.endTime, label: p.label,
  words: patternInWords(p.rrule, p.startTime, p.endTime),
});
export const toTimeOff = (o: typeof timeOff.$inferSelect): TimeOff => ({ id: o.id, firstDay: o.firstDay, lastDay: o.lastDay, reason: o.reason });
const toBay = (b: typeof bays.$inferSelect): Bay => ({ id: b.id, name: b.name, position: b.position });

/** Bays, opening hours and each technician's patterns and time off, for the person's sites (or one of them). */
export async function readCapacity(db: DbOrTx, user: SessionUser, q: CapacityQuery): Promise<Capacity> {
  if (q.site && !canSeeSite(user, q.site)) throw notFound('That site');
  const siteIds = q.site ? [q.site] : [...user.siteIds];
  if (!siteIds.length) return { sites: [] };
  const siteRows = await db.select().from(sites).where(inArray(sites.id, siteIds)).orderBy(asc(sites.name));
  if (q.site && !siteRows.length) throw notFound('That site');
  const ids = siteRows.map((s) => s.id);
  if (!ids.length) return { sites: [] };
  const bayRows = await db.select().from(bays).where(inArray(bays.siteId, ids)).orderBy(asc(bays.position), asc(bays.name));
  const hourRows = await db.select().from(siteHours).where(inArray(siteHours.siteId, ids)).orderBy(asc(siteHours.weekday));
  const techRows = await db
    .select({ id: users.id, name: users.name, siteId: userSites.siteId })
    .from(users)
    .innerJoin(userSites, eq(userSites.userId, users.id))
    .where(and(inArray(userSites.siteId, ids), eq(users.role, 'technician'), eq(users.disabled, false)))
    .orderBy(asc(users.name), asc(users.id));
  const techIds = [...new Set(techRows.map((t) => t.id))];
  const patternRows = techIds.length
    ? await db.select().from(workPatterns).where(and(inArray(workPatterns.userId, techIds), inArray(workPatterns.siteId, ids))).orderBy(asc(workPatterns.startsOn), asc(workPatterns.startTime), asc(workPatterns.id))
    : [];
  const offRows = techIds.length ? await db.select().from(timeOff).where(inArray(timeOff.userId, techIds)).orderBy(asc(timeOff.firstDay), asc(timeOff.id)) : [];
  const out: CapacitySite[] = siteRows.map((s) => ({
    id: s.id,
    name: s.name,
    timeZone: s.timeZone,
    bays: bayRows.filter((b) => b.siteId === s.id).map(toBay),
    hours: hourRows.filter((h) => h.siteId === s.id).map(({ weekday, opensAt, closesAt }) => ({ weekday, opensAt, closesAt })),
    technicians: techRows
      .filter((t) => t.siteId === s.id)
      .map((t) => ({
        id: t.id,
        name: t.name,
        patterns: patternRows.filter((p) => p.userId === t.id && p.siteId === s.id).map(toPattern),
        timeOff: offRows.filter((o) => o.userId === t.id).map(toTimeOff),
      })),
  }));
  return { sites: out };
}

/** A site the person works at, locked for the rest of the transaction (bay numbering and counts stay consistent). */
export async function lockSite(tx: DbOrTx, user: SessionUser, siteId: string) {
  const [site] = canSeeSite(user, siteId) ? await tx.select().from(sites).where(eq(sites.id, siteId)).for('update') : [];
  if (!site) throw notFound('That site');
  return site;
}

/** Replaces the site's whole week of opening hours in one transaction. */
export async function putHours(db: Db, user: SessionUser, siteId: string, hours: DayHours[], now: Date): Promise<{ hours: DayHours[] }> {
  const sorted = [...hours].sort((a, b) => a.weekday - b.weekday);
  await db.transaction(async (tx) => {
    await lockSite(tx, user, siteId);
    const before = await tx.select().from(siteHours).where(eq(siteHours.siteId, siteId));
    await tx.delete(siteHours).where(eq(siteHours.siteId, siteId));
    if (sorted.length) await tx.insert(siteHours).values(sorted.map((h) => ({ siteId, ...h })));
    await audit(tx, { userId: user.id, action: 'update', entity: 'site_hours', entityId: siteId, changes: { before: before.map(({ weekday, opensAt, closesAt }) => ({ weekday, opensAt, closesAt })), after: sorted } });
  });
  await replanAfter(db, { siteIds: [siteId], why: 'opening hours changed' }, now);
  return { hours: sorted };
}

// ── Bays ─────────────────────────────────────────────────────────────────────
const bayList = (tx: DbOrTx, siteId: string) => tx.select().from(bays).where(eq(bays.siteId, siteId)).orderBy(asc(bays.position), asc(bays.name));

export const bayCount = async (tx: DbOrTx, siteId: string) => (await bayList(tx, siteId)).length;

/** Renumbers the site's bays 1…n in the given order and keeps sites.bays equal to their number. */
async function renumber(tx: DbOrTx, siteId: string, ordered: { id: string; position: number }[]) {
  for (const [i, b] of ordered.entries()) if (b.position !== i + 1) await tx.update(bays).set({ position: i + 1 }).where(eq(bays.id, b.id));
  await tx.update(sites).set({ bays: ordered.length }).where(eq(sites.id, siteId));
}

/** Adds bays at the end, named "Bay n" with the first numbers not taken. */
export async function addBays(tx: DbOrTx, siteId: string, count: number, name?: string) {
  const existing = await bayList(tx, siteId);
  const taken = new Set(existing.map((b) => b.name.toLowerCase()));
  if (existing.length + count > 100) throw conflict(`A site may have at most 100 bays; ${existing.length} are set up here.`);
  if (name && taken.has(name.toLowerCase())) throw conflict(`This site already has a bay named “${name}”. Choose another name.`, [{ path: 'name', message: 'Already in use.' }]);
  const added: (typeof bays.$inferSelect)[] = [];
  let n = existing.length;
  for (let i = 0; i < count; i++) {
    let bayName = name;
    if (!bayName) {
      do n++;
      while (taken.has(`bay ${n}`));
      bayName = `Bay ${n}`;
    }
    taken.add(bayName.toLowerCase());
    const [row] = await tx.insert(bays).values({ siteId, name: bayName, position: existing.length + added.length + 1 }).returning();
    added.push(row);
  }
  await renumber(tx, siteId, [...existing, ...added]);
  return added;
}

/** Refuses, in words, to remove a bay that still has visits planned from today on at its site. */
async function refuseIfPlanned(tx: DbOrTx, bay: typeof bays.$inferSelect, timeZone: string, now: Date) {
  const today = startOfDayInZone(todayInZone(timeZone, now), timeZone);
  const [r] = await tx
    .select({ n: sql<number>`count(*)::int`, first: sql<string>`min(${visits.startAt})` })
    .from(visits)
    .where(and(eq(visits.bayId, bay.id), eq(visits.status, 'planned'), gte(visits.endAt, new Date(today))));
  if (r && Number(r.n) > 0) {
    const first = Math.max(new Date(r.first).getTime(), today);
    throw conflict(`${bay.name} has ${r.n} ${Number(r.n) === 1 ? 'visit' : 'visits'} planned from ${formatInZone(first, timeZone, 'EEE d MMM')}. Move them first.`);
  }
}

/** Removes bays from the end until `count` are left (each refused while it has visits planned). */
export async function trimBays(tx: DbOrTx, siteId: string, timeZone: string, count: number, now: Date) {
  const existing = await bayList(tx, siteId);
  const gone = existing.slice(count);
  for (const b of gone.reverse()) await refuseIfPlanned(tx, b, timeZone, now);
  if (gone.length) await tx.delete(bays).where(inArray(bays.id, gone.map((b) => b.id)));
  await renumber(tx, siteId, existing.slice(0, count));
  return gone;
}

export async function createBay(db: Db, user: SessionUser, siteId: string, name: string | undefined, now: Date): Promise<{ bay: Bay }> {
  const bay = await db.transaction(async (tx) => {
    await lockSite(tx, user, siteId);
    const [row] = await addBays(tx, siteId, 1, name);
    const [fresh] = await tx.select().from(bays).where(eq(bays.id, row.id));
    await audit(tx, { userId: user.id, action: 'create', entity: 'bay', entityId: row.id, changes: { siteId, name: row.name } });
    return fresh;
  });
  await replanAfter(db, { siteIds: [siteId], why: 'bay added' }, now);
  return { bay: toBay(bay) };
}

async function bayOf(tx: DbOrTx, user: SessionUser, id: string) {
  const [bay] = await tx.select().from(bays).where(eq(bays.id, id));
  if (!bay || !canSeeSite(user, bay.siteId)) throw notFound('That bay');
  const site = await lockSite(tx, user, bay.siteId);
  return { bay, site };
}

/** Renames a bay or moves it to another place in the site's order. */
export async function patchBay(db: Db, user: SessionUser, id: string, patch: BayPatch, now: Date): Promise<{ bay: Bay }> {
  const { bay, siteId } = await db.transaction(async (tx) => {
    const { bay: before } = await bayOf(tx, user, id);
    if (patch.name !== undefined && patch.name !== before.name) {
      const [dupe] = await tx.select({ id: bays.id }).from(bays).where(and(eq(bays.siteId, before.siteId), ne(bays.id, id), sql`lower(${bays.name}) = lower(${patch.name})`));
      if (dupe) throw conflict(`This site already has a bay named “${patch.name}”. Choose another name.`, [{ path: 'name', message: 'Already in use.' }]);
      await tx.update(bays).set({ name: patch.name }).where(eq(bays.id, id));
    }
    if (patch.position !== undefined) {
      const others = (await bayList(tx, before.siteId)).filter((b) => b.id !== id);
      const at = Math.min(patch.position, others.length + 1) - 1;
      others.splice(at, 0, before);
      await renumber(tx, before.siteId, others);
    }
    await audit(tx, { userId: user.id, action: 'update', entity: 'bay', entityId: id, changes: patch });
    const [after] = await tx.select().from(bays).where(eq(bays.id, id));
    return { bay: after, siteId: before.siteId };
  });
  await replanAfter(db, { siteIds: [siteId], why: 'bay changed' }, now);
  return { bay: toBay(bay) };
}

export async function deleteBay(db: Db, user: SessionUser, id: string, now: Date): Promise<{ deleted: string }> {
  const siteId = await db.transaction(async (tx) => {
    const { bay, site } = await bayOf(tx, user, id);
    await refuseIfPlanned(tx, bay, site.timeZone, now);
    await tx.delete(bays).where(eq(bays.id, id));
    await renumber(tx, site.id, await bayList(tx, site.id));
    await audit(tx, { userId: user.id, action: 'delete', entity: 'bay', entityId: id, changes: { siteId: site.id, name: bay.name } });
    return site.id;
  });
  await replanAfter(db, { siteIds: [siteId], why: 'bay removed' }, now);
  return { deleted: id };
}
