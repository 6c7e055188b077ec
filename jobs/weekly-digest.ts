import { and, eq, inArray } from 'drizzle-orm';
import { getISOWeek, getISOWeekYear } from 'date-fns';
import type { JobDeps, JobResult } from './types';
import { bikes, sites, users } from '../server/db/schema';
import { loadSessionUser } from '../server/services/users';
import { listDue } from '../server/services/due-list';
import { enqueue, deliverOutbox } from '../server/mail/outbox';
import { renderDigest, type DigestPlanSite } from '../server/mail/digest';
import { planAnswer } from '../server/services/workshop-plan';
import type { SessionUser } from '../shared/schemas/auth';
import type { Db } from '../server/db/client';
import { valveWarningsFor } from '../server/services/valve-warnings';
import { addDaysIso, todayInZone, toUtcDate } from '../shared/domain/dates';

/** ISO 8601 week of a calendar date, e.g. "2026-W49": names the digest so one week's is sent once. */
export const isoWeekLabel = (date: string) => {
  const d = toUtcDate(date);
  return `${getISOWeekYear(d)}-W${String(getISOWeek(d)).padStart(2, '0')}`;
};

/** Each of the manager's sites: visits per day for the next seven days, capacity used, and work not placed. */
async function digestPlan(db: Db, manager: SessionUser, now: Date): Promise<DigestPlanSite[]> {
  const siteRows = await db.select({ id: sites.id, name: sites.name, tz: sites.timeZone }).from(sites).where(inArray(sites.id, manager.siteIds)).orderBy(sites.name);
  const out: DigestPlanSite[] = [];
  for (const site of siteRows) {
    const from = todayInZone(site.tz, now);
    const plan = await planAnswer(db, manager, { site: site.id, from, to: addDaysIso(from, 6) }, now);
    out.push({
      siteId: site.id,
      siteName: site.name,
      days: plan.capacity.map((c) => ({
        date: c.date,
        plannedMinutes: c.plannedMinutes,
        availableMinutes: c.availableMinutes,
        visits: plan.visits.filter((v) => todayInZone(site.tz, new Date(v.start)) === c.date).map((v) => v.fleetNumber),
      })),
      unplaced: plan.unplaced.map((u) => `${u.fleetNumber} ${u.itemName}${u.dueDate ? ` (due ${u.dueDate})` : ''}: ${u.reason} ${u.remedy}`.trim()),
    });
  }
  return out;
}

export async function run(deps: JobDeps): Promise<JobResult> {
  const now = deps.now();
  const managers = await deps.db.select({ id: users.id }).from(users).where(and(eq(users.role, 'manager'), eq(users.disabled, false)));
  let queued = 0;
  for (const { id } of managers) {
    const m = await loadSessionUser(deps.db, id);
    if (!m || !m.siteIds.length) continue;
    const [site] = await deps.db.select({ tz: sites.timeZone }).from(sites).where(inArray(sites.id, m.siteIds)).limit(1);
    const today = todayInZone(site.tz, now);
    const week = isoWeekLabel(today);
    const due = await listDue(deps.db, m.siteIds, { within: 7 }, now);
    const grounded = await deps.db
      .select({ fleetNumber: bikes.fleetNumber, siteName: sites.name, reason: bikes.statusReason })
      .from(bikes)
      .innerJoin(sites, eq(sites.id, bikes.siteId))
      .where(and(inArray(bikes.siteId, m.siteIds), eq(bikes.status, 'out_of_service')))
      .orderBy(bikes.fleetNumber);
    const mail = renderDigest({
      managerName: m.name,
      weekLabel: week,
      today,
      overdue: due.filter((d) => d.status === 'overdue'),
      thisWeek: due.filter((d) => d.status !== 'overdue'),
      grounded,
      valveWarnings: await valveWarningsFor(deps.db, m.siteIds),
      plan: await digestPlan(deps.db, m, now),
      appUrl: deps.publicUrl,
    });
    if (await enqueue(deps.db, { dedupeKey: `digest:${week}:${m.id}`, to: m.email, ...mail }, now)) queued++;
  }
  const delivery = await deliverOutbox(deps.db, deps.mail.transport(), deps.mail.from, now);
  return {
    summary: `Weekly due list: ${queued} queued for ${managers.length} managers; sent ${delivery.sent}, ${delivery.retrying} to retry, ${delivery.failed} failed.`,
    queued,
    ...delivery,
  };
}
