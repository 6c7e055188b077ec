import { and, eq, inArray, sql } from 'drizzle-orm';
import type { Db, DbOrTx, Tx } from '../db/client';
import { serviceTasks, settings, sites, unplacedTasks, users, visits, visitTasks } from '../db/schema';
import { jsonRows, sqlList } from '../db/json-rows';
import type { SessionUser } from '../../shared/schemas/auth';
import type { MyDay, NextVisit, PlanAnswer, PlanBooking, PlanCapacity, PlanQuery, PlanVisit, VisitMove } from '../../shared/schemas/plan';
import type { PlanResult, PlannedVisit } from '../../shared/domain/plan-types';
import { checkPlacement, dueWithinHorizon, planWorkshop } from '../../shared/domain/planner';
import { addDaysIso, daysBetween, formatInZone, startOfDayInZone, todayInZone } from '../../shared/domain/dates';
import { canSeeSite } from '../../shared/domain/policies';
import { audit } from '../audit';
import { conflict, notFound } from '../http-error';
import { loadPlanInput, type LoadedPlan } from './workshop-plan-inputs';
import { setReplanner, type PlanChange } from './replan';

const PLANNED_AT_KEY = 'plan_ran_at';

export interface PlanRunReport {
  visits: number;
  unplaced: number;
  cancelled: number;
  moved: number;
  ms: number;
}

/**
 * Works the plan out again for some sites (or, when `bikeIds` is given, only those bikes' work,
 * around every other visit) and stores it in one transaction: a visit that stays keeps its id, and
 * its sequence rises when it moves; a visit no longer needed is cancelled (so calendars drop it).
 */
export async function runPlan(db: Db, change: PlanChange & { now: Date }): Promise<PlanRunReport> {
  const started = Date.now();
  const loaded = await loadPlanInput(db, { siteIds: change.siteIds, now: change.now, bikeIds: change.bikeIds });
  const result = planWorkshop(dueWithinHorizon(loaded.input));
  const report = await db.transaction((tx) => storePlan(tx, loaded, result, change));
  return { ...report, ms: Date.now() - started };
}

// Whatever loads the plan service (the app, the job runner) gets re-plans after bookings, capacity,
// check-ins and closed tasks: their writers call replanAfter once their transaction has committed.
setReplanner(async (db, change, now) => {
  await runPlan(db, { ...change, now });
});

async function storePlan(tx: Tx, loaded: LoadedPlan, result: PlanResult, change: PlanChange & { now: Date }) {
  const siteIds = loaded.input.sites.map((s) => s.id);
  const now = change.now;
  if (!siteIds.length) return { visits: 0, unplaced: 0, cancelled: 0, moved: 0 };
  // One writer per site at a time (several app instances may re-plan at once).
  await tx.execute(sql`select id from sites where id in (${sqlList(siteIds)}) order by id for update`);

  const oldIds = loaded.replaceable.map((r) => r.id);
  const oldRows = oldIds.length ? await tx.select().from(visits).where(and(inArray(visits.id, oldIds), eq(visits.status, 'planned'))) : [];
  const oldById = new Map(oldRows.map((r) => [r.id, r]));
  const oldTasks = new Map(loaded.replaceable.map((r) => [r.id, new Set(r.taskIds)]));
  const used = new Set<string>();
  // A new visit takes the id of an old one of the same bike that shares a task with it.
  const matchOf = (v: PlannedVisit) => {
    for (const r of loaded.replaceable) {
      if (used.has(r.id) || r.bikeId !== v.bikeId || !oldById.has(r.id)) continue;
      if (v.taskIds.some((t) => oldTasks.get(r.id)!.has(t))) return r.id;
    }
    return undefined;
  };

  // Every task this run planned leaves the visit it was in (placed again, or not placed at all).
  const plannedTaskIds = [...new Set([...loaded.input.tasks.map((t) => t.id), ...result.visits.flatMap((v) => v.taskIds)])];
  if (plannedTaskIds.length) await tx.delete(visitTasks).where(inArray(visitTasks.taskId, plannedTaskIds));

  let moved = 0;
  const links: { taskId: string; visitId: string }[] = [];
  for (const v of result.visits) {
    const id = matchOf(v);
    const values = {
      siteId: v.siteId,
      bikeId: v.bikeId,
      bayId: v.bayId,
      technicianId: v.technicianId,
      startAt: new Date(v.start),
      endAt: new Date(v.end),
      latestDate: v.latestDate,
      why: v.why,
      updatedAt: now,
    };
    let visitId: string;
    if (id) {
      used.add(id);
      const old = oldById.get(id)!;
      const changed =
        old.startAt.getTime() !== v.start || old.endAt.getTime() !== v.end || old.bayId !== v.bayId || old.technicianId !== v.technicianId || !sameSet(oldTasks.get(id)!, v.taskIds);
      if (changed) moved++;
      await tx.update(visits).set({ ...values, sequence: changed ? old.sequence + 1 : old.sequence }).where(eq(visits.id, id));
      visitId = id;
    } else {
      const [row] = await tx.insert(visits).values({ ...values, createdAt: now }).returning({ id: visits.id });
      visitId = row.id;
    }
    for (const taskId of v.taskIds) links.push({ taskId, visitId });
  }
  if (links.length) await tx.insert(visitTasks).values(links);

  // Tasks go to the technician their visit is planned with, unless the work is already under way.
  for (const v of result.visits) {
    await tx
      .update(serviceTasks)
      .set({ assigneeId: v.technicianId })
      .where(and(inArray(serviceTasks.id, v.taskIds), eq(serviceTasks.status, 'open'), sql`${serviceTasks.assigneeId} is distinct from ${v.technicianId}`));
  }

  // Old visits not taken up, and visits left without open work, end: done if some of their work was signed off, else cancelled.
  const unused = oldIds.filter((id) => !used.has(id));
  if (unused.length) await tx.delete(visitTasks).where(and(inArray(visitTasks.visitId, unused), sql`${visitTasks.taskId} in (select id from service_tasks where status in ('open', 'in_progress'))`));
  const ended = await tx.execute(sql`
    update visits v
       set status = case when exists (select 1 from visit_tasks vt join service_tasks t on t.id = vt.task_id where vt.visit_id = v.id and t.status = 'done') then 'done' else 'cancelled' end,
           sequence = v.sequence + 1, updated_at = ${now.toISOString()}
     where v.site_id in (${sqlList(siteIds)}) and v.status = 'planned'
       and not exists (select 1 from visit_tasks vt join service_tasks t on t.id = vt.task_id where vt.visit_id = v.id and t.status in ('open', 'in_progress'))
    returning v.id`);
  const cancelled = (ended as unknown as { rows: unknown[] }).rows.length;

  // What could not be placed before its due date, replaced for the scope that was planned.
  const scopeTasks = [...loaded.input.tasks.map((t) => t.id)];
  if (change.bikeIds) {
    if (scopeTasks.length) await tx.delete(unplacedTasks).where(inArray(unplacedTasks.taskId, scopeTasks));
    if (change.bikeIds.length) await tx.delete(unplacedTasks).where(inArray(unplacedTasks.bikeId, change.bikeIds));
  } else await tx.delete(unplacedTasks).where(inArray(unplacedTasks.siteId, siteIds));
  if (result.unplaced.length) {
    await tx
      .insert(unplacedTasks)
      .values(result.unplaced.map((u) => ({ taskId: u.taskId, bikeId: u.bikeId, siteId: u.siteId, reason: u.reason, remedy: u.remedy, computedAt: now })))
      .onConflictDoUpdate({ target: unplacedTasks.taskId, set: { reason: sql`excluded.reason`, remedy: sql`excluded.remedy`, computedAt: now } });
  }

  const [ran] = await tx.select().from(settings).where(eq(settings.key, PLANNED_AT_KEY));
  const stamps = { ...((ran?.value as Record<string, string> | undefined) ?? {}) };
  for (const id of siteIds) stamps[id] = now.toISOString();
  await tx.insert(settings).values({ key: PLANNED_AT_KEY, value: stamps }).onConflictDoUpdate({ target: settings.key, set: { value: stamps, updatedAt: now } });
  return { visits: result.visits.length, unplaced: result.unplaced.length, cancelled, moved };
}

const sameSet = (a: Set<string>, b: string[]) => a.size === b.length && b.every((x) => a.has(x));

// ── Reading the plan ──────────────────────────────────────────────────────────

interface VisitRow extends Omit<PlanVisit, 'tasks'> {
  tasks: PlanVisit['tasks'];
}

const visitSelect = sql`
  select v.id, v.bike_id as "bikeId", b.fleet_number as "fleetNumber", m.name as "modelName", v.site_id as "siteId",
         to_json(v.start_at) #>> '{}' as start, to_json(v.end_at) #>> '{}' as "end", v.bay_id as "bayId", bay.name as "bayName",
         v.technician_id as "technicianId", u.name as "technicianName", v.latest_date as "latestDate", v.pinned, v.sequence, v.why,
         coalesce((select json_agg(vt.task_id order by i.safety_critical desc, t.due_date, i.name) from visit_tasks vt join service_tasks t on t.id = vt.task_id join service_items i on i.id = t.service_item_id where vt.visit_id = v.id), '[]'::json) as "taskIds",
         coalesce((select json_agg(json_build_object('id', t.id, 'itemName', i.name, 'minutes', t.estimated_minutes, 'dueDate', t.due_date, 'safetyCritical', i.safety_critical, 'status', t.status)
                                   order by i.safety_critical desc, t.due_date, i.name)
                     from visit_tasks vt join service_tasks t on t.id = vt.task_id join service_items i on i.id = t.service_item_id where vt.visit_id = v.id), '[]'::json) as tasks
    from visits v
    join bikes b on b.id = v.bike_id
    join bike_models m on m.id = b.model_id
    join bays bay on bay.id = v.bay_id
    join users u on u.id = v.technician_id`;

const iso = (s: string) => new Date(s).toISOString();
const normalise = (v: VisitRow): PlanVisit => ({ ...v, start: iso(v.start), end: iso(v.end) });

export async function readVisits(db: DbOrTx, where: ReturnType<typeof sql>): Promise<PlanVisit[]> {
  const rows = await jsonRows<VisitRow>(db, sql`${visitSelect} where v.status = 'planned' and ${where}`, sql`q.start, q."bayName", q.id`);
  return rows.map(normalise);
}

/** The plan of the caller's sites between two days: visits, what is not placed, capacity per day, bookings and the board's rows. */
export async function planAnswer(db: Db, user: SessionUser, q: PlanQuery, now: Date): Promise<PlanAnswer> {
  const siteIds = q.site ? (canSeeSite(user, q.site) ? [q.site] : []) : user.siteIds;
  if (q.site && !siteIds.length) throw notFound('That site');
  const siteRows = siteIds.length ? await db.select().from(sites).where(inArray(sites.id, siteIds)) : [];
  const zone = siteRows[0]?.timeZone ?? 'UTC';
  const fromDay = q.from ?? todayInZone(zone, now);
  const toDay = q.to ?? addDaysIso(fromDay, 13);
  if (daysBetween(fromDay, toDay) > 62) throw conflict('Ask for at most nine weeks of the plan at once.');
  const from = Math.min(...siteRows.map((s) => startOfDayInZone(fromDay, s.timeZone)), Number.MAX_SAFE_INTEGER);
  const to = Math.max(...siteRows.map((s) => startOfDayInZone(addDaysIso(toDay, 1), s.timeZone)), 0);
  const answer: PlanAnswer = { from: fromDay, to: toDay, visits: [], unplaced: [], capacity: [], bookings: [], bays: [], technicians: [], plannedAt: null };
  if (!siteRows.length) return answer;

  answer.visits = await readVisits(db, sql`v.site_id in (${sqlList(siteIds)}) and v.start_at < ${new Date(to).toISOString()} and v.end_at > ${new Date(from).toISOString()}`);
  answer.unplaced = await jsonRows<PlanAnswer['unplaced'][number]>(
    db,
    sql`select u.task_id as "taskId", u.bike_id as "bikeId", b.fleet_number as "fleetNumber", u.site_id as "siteId", i.name as "itemName",
               t.due_date as "dueDate", u.reason, u.remedy
          from unplaced_tasks u join service_tasks t on t.id = u.task_id join service_items i on i.id = t.service_item_id join bikes b on b.id = u.bike_id
         where u.site_id in (${sqlList(siteIds)}) and t.status in ('open', 'in_progress')`,
    sql`q."dueDate" nulls last, q."fleetNumber", q."itemName"`,
  );

  // Capacity and the board's rows come from the same inputs the planner uses, over the asked days.
  const loaded = await loadPlanInput(db, { siteIds, now, window: { from, to } });
  answer.bays = loaded.input.bays.map(({ id, siteId, name }) => ({ id, siteId, name }));
  answer.technicians = loaded.input.technicians.map(({ id, siteId, name }) => ({ id, siteId, name })).filter((t, i, all) => all.findIndex((x) => x.id === t.id && x.siteId === t.siteId) === i);
  answer.capacity = capacityByDay(loaded, answer.visits, fromDay, toDay);
  answer.bookings = boardBookings(loaded);

  const [ran] = await db.select().from(settings).where(eq(settings.key, 'plan_ran_at'));
  const stamps = (ran?.value as Record<string, string> | undefined) ?? {};
  const times = siteIds.map((id) => stamps[id]).filter(Boolean).sort();
  answer.plannedAt = times[0] ?? null;
  return answer;
}

function capacityByDay(loaded: LoadedPlan, planned: PlanVisit[], fromDay: string, toDay: string): PlanCapacity[] {
  const out: PlanCapacity[] = [];
  for (const site of loaded.input.sites) {
    const bayCount = loaded.input.bays.filter((b) => b.siteId === site.id).length;
    for (let day = fromDay; day <= toDay; day = addDaysIso(day, 1)) {
      const a = startOfDayInZone(day, site.timeZone);
      const b = startOfDayInZone(addDaysIso(day, 1), site.timeZone);
      const within = (x: { start: number; end: number }) => Math.max(0, Math.min(b, x.end) - Math.max(a, x.start)) / 60_000;
      const people = loaded.input.technicians.filter((t) => t.siteId === site.id).reduce((n, t) => n + t.shifts.reduce((m, s) => m + within(s), 0), 0);
      const bayMinutes = bayCount * site.open.reduce((m, s) => m + within(s), 0);
      const plannedMinutes = planned
        .filter((v) => v.siteId === site.id)
        .reduce((m, v) => m + within({ start: Date.parse(v.start), end: Date.parse(v.end) }), 0);
      out.push({ siteId: site.id, date: day, plannedMinutes: Math.round(plannedMinutes), availableMinutes: Math.round(Math.min(people, bayMinutes)) });
    }
  }
  return out;
}

function boardBookings(loaded: LoadedPlan): PlanBooking[] {
  const modelName = new Map(loaded.input.bikes.map((b) => [b.modelId, b.modelName]));
  const out: PlanBooking[] = [];
  for (const b of loaded.input.bikes) {
    for (const k of b.bookings)
      out.push({ bookingId: k.bookingId, siteId: b.siteId, bikeId: b.id, modelId: b.modelId, modelName: b.modelName, quantity: 1, kind: k.kind, title: k.title, start: new Date(k.start).toISOString(), end: new Date(k.end).toISOString() });
  }
  for (const d of loaded.input.demands)
    out.push({ bookingId: d.bookingId, siteId: d.siteId, bikeId: null, modelId: d.modelId, modelName: modelName.get(d.modelId) ?? null, quantity: d.quantity, kind: d.kind, title: d.title, start: new Date(d.start).toISOString(), end: new Date(d.end).toISOString() });
  return out.sort((a, b) => a.start.localeCompare(b.start) || a.bookingId.localeCompare(b.bookingId));
}

// ── Moving a visit by hand ─────────────────────────────────────────────────────

/**
 * A manager moves a visit to another time, bay or technician. Every other visit stays where it is;
 * the move is refused, in words, when it clashes with a bay, a technician's hours, a booking, the
 * cover a model booking needs, or falls after the visit's latest day. A move that stands pins the visit.
 */
export async function moveVisit(db: Db, user: SessionUser, visitId: string, to: VisitMove, now: Date): Promise<PlanVisit> {
  const [row] = await db.select().from(visits).where(eq(visits.id, visitId));
  if (!row || row.status !== 'planned' || !canSeeSite(user, row.siteId)) throw notFound('That visit');
  const taskRows = await db
    .select({ id: visitTasks.taskId, minutes: serviceTasks.estimatedMinutes, status: serviceTasks.status })
    .from(visitTasks)
    .innerJoin(serviceTasks, eq(serviceTasks.id, visitTasks.taskId))
    .where(eq(visitTasks.visitId, visitId));
  const open = taskRows.filter((t) => t.status === 'open' || t.status === 'in_progress');
  if (!open.length) throw conflict('Every task of this visit is signed off or withdrawn: there is nothing left to move.');
  if (open.some((t) => t.status === 'in_progress')) throw conflict('Work on this visit has started; it cannot be moved. Finish or withdraw the task first.');

  const loaded = await loadPlanInput(db, { siteIds: [row.siteId], now, movingVisitId: visitId });
  const site = loaded.input.sites[0];
  const start = Date.parse(to.start);
  const minutes = open.reduce((n, t) => n + Math.max(15, t.minutes), 0);
  const clashes = checkPlacement(loaded.input, { id: visitId, bikeId: row.bikeId, taskIds: open.map((t) => t.id) }, { start, bayId: to.bayId, technicianId: to.technicianId });
  const latestEnd = startOfDayInZone(addDaysIso(row.latestDate, 1), site.timeZone);
  const end = start + minutes * 60_000;
  if (end > latestEnd && !clashes.some((c) => c.includes('after'))) {
    clashes.push(`That is after the visit's latest day, ${formatInZone(latestEnd - 1, site.timeZone, 'EEE d MMM')}: its earliest item falls due then.`);
  }
  if (clashes.length) throw conflict(clashes.join(' '));

  const [tech] = await db.select({ name: users.name }).from(users).where(eq(users.id, user.id));
  const why = [`Moved here by ${tech?.name ?? 'a manager'} on ${formatInZone(now.getTime(), site.timeZone, 'EEE d MMM HH:mm')}; the planner leaves it here.`, ...row.why.filter((w) => !w.startsWith('Moved here by'))];
  await db.transaction(async (tx) => {
    await tx
      .update(visits)
      .set({ startAt: new Date(start), endAt: new Date(end), bayId: to.bayId, technicianId: to.technicianId, pinned: true, sequence: row.sequence + 1, why, updatedAt: now })
      .where(eq(visits.id, visitId));
    await tx.update(serviceTasks).set({ assigneeId: to.technicianId }).where(and(inArray(serviceTasks.id, open.map((t) => t.id)), eq(serviceTasks.status, 'open')));
    await audit(tx, {
      userId: user.id,
      action: 'move',
      entity: 'visit',
      entityId: visitId,
      changes: { from: { start: row.startAt.toISOString(), bayId: row.bayId, technicianId: row.technicianId }, to: { start: new Date(start).toISOString(), bayId: to.bayId, technicianId: to.technicianId } },
    });
  });
  const [visit] = await readVisits(db, sql`v.id = ${visitId}`);
  return visit;
}

// ── The technician's day and the desk's notice ─────────────────────────────────

export async function myDay(db: Db, user: SessionUser, date: string | undefined, now: Date): Promise<MyDay> {
  const [site] = user.siteIds.length ? await db.select({ timeZone: sites.timeZone }).from(sites).where(inArray(sites.id, user.siteIds)).limit(1) : [];
  const zone = site?.timeZone ?? 'UTC';
  const day = date ?? todayInZone(zone, now);
  const a = new Date(startOfDayInZone(day, zone)).toISOString();
  const b = new Date(startOfDayInZone(addDaysIso(day, 1), zone)).toISOString();
  return { date: day, visits: await readVisits(db, sql`v.technician_id = ${user.id} and v.start_at < ${b} and v.end_at > ${a} and v.site_id in (${sqlList(user.siteIds)})`) };
}

/** Visits from now to the end of the day after tomorrow, for the bikes at the caller's sites. */
export async function nextVisits(db: Db, user: SessionUser, siteId: string | undefined, now: Date): Promise<NextVisit[]> {
  const siteIds = siteId ? (canSeeSite(user, siteId) ? [siteId] : []) : user.siteIds;
  if (!siteIds.length) return [];
  const rows = await jsonRows<{ bikeId: string; visitId: string; start: string; end: string; bayName: string; siteTimeZone: string }>(
    db,
    sql`select v.bike_id as "bikeId", v.id as "visitId", to_json(v.start_at) #>> '{}' as start, to_json(v.end_at) #>> '{}' as "end", bay.name as "bayName", s.time_zone as "siteTimeZone"
          from visits v join bays bay on bay.id = v.bay_id join sites s on s.id = v.site_id
         where v.status = 'planned' and v.site_id in (${sqlList(siteIds)}) and v.end_at > ${now.toISOString()}
           and v.start_at < ${new Date(now.getTime() + 3 * 86_400_000).toISOString()}`,
    sql`q.start`,
  );
  return rows
    .filter((r) => {
      const last = addDaysIso(todayInZone(r.siteTimeZone, now), 2);
      return Date.parse(r.start) < startOfDayInZone(addDaysIso(last, 1), r.siteTimeZone);
    })
    .map((r) => ({ ...r, start: iso(r.start), end: iso(r.end), today: todayInZone(r.siteTimeZone, new Date(Date.parse(r.start))) === todayInZone(r.siteTimeZone, now) || Date.parse(r.start) <= now.getTime() }));
}

/** When a bike's task is signed off or withdrawn: a visit of the bike ends when nothing open is left in it (done, or cancelled if nothing in it was done). */
export async function settleVisitsOfBike(db: DbOrTx, bikeId: string, now: Date) {
  await db.execute(sql`
    update visits v
       set status = case when exists (select 1 from visit_tasks vt join service_tasks t on t.id = vt.task_id where vt.visit_id = v.id and t.status = 'done') then 'done' else 'cancelled' end,
           sequence = v.sequence + 1, updated_at = ${now.toISOString()}
     where v.status = 'planned' and v.bike_id = ${bikeId}
       and not exists (select 1 from visit_tasks vt join service_tasks t on t.id = vt.task_id where vt.visit_id = v.id and t.status in ('open', 'in_progress'))`);
}

export interface CalendarVisit {
  id: string;
  sequence: number;
  status: 'planned' | 'done' | 'cancelled';
  start: string;
  end: string;
  updatedAt: string;
  fleetNumber: string;
  modelName: string;
  siteName: string;
  bayName: string;
  technicianName: string;
  items: string[];
}

/**
 * The visits a person's calendar feed carries: a technician's own, everyone else's at their sites;
 * from a week back to six weeks ahead. Cancelled ones stay for a week after the change, so calendar
 * apps that fetched them see them go.
 */
export async function visitsForCalendar(db: DbOrTx, user: SessionUser, now: Date): Promise<CalendarVisit[]> {
  if (!user.siteIds.length) return [];
  const back = new Date(now.getTime() - 7 * 86_400_000).toISOString();
  const ahead = new Date(now.getTime() + 42 * 86_400_000).toISOString();
  const mine = user.role === 'technician' ? sql`and v.technician_id = ${user.id}` : sql``;
  return jsonRows<CalendarVisit>(
    db,
    sql`select v.id, v.sequence, v.status, to_json(v.start_at) #>> '{}' as start, to_json(v.end_at) #>> '{}' as "end", to_json(v.updated_at) #>> '{}' as "updatedAt",
               b.fleet_number as "fleetNumber", m.name as "modelName", s.name as "siteName", bay.name as "bayName", u.name as "technicianName",
               coalesce((select json_agg(i.name || ' (' || t.estimated_minutes || ' min)' order by i.name) from visit_tasks vt join service_tasks t on t.id = vt.task_id
                           join service_items i on i.id = t.service_item_id where vt.visit_id = v.id), '[]'::json) as items
          from visits v join bikes b on b.id = v.bike_id join bike_models m on m.id = b.model_id join sites s on s.id = v.site_id
          join bays bay on bay.id = v.bay_id join users u on u.id = v.technician_id
         where v.site_id in (${sqlList(user.siteIds)}) ${mine}
           and v.start_at >= ${back} and v.start_at < ${ahead}
           and (v.status <> 'cancelled' or v.updated_at >= ${back})`,
    sql`q.start, q.id`,
  );
}
