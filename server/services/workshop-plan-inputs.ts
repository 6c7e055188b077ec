import { and, asc, eq, gt, inArray, lt, ne, or, sql } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { bays, bikeModels, bikes, bookings, settings, siteHours, sites, timeOff, users, workPatterns } from '../db/schema';
import { jsonRows, sqlList } from '../db/json-rows';
import type { FixedVisit, ModelDemand, PlanBike, PlanInput, PlanTask, PlanTechnician } from '../../shared/domain/plan-types';
import { addDaysIso, startOfDayInZone, todayInZone } from '../../shared/domain/dates';
import { bookingOccurrences } from '../../shared/domain/bookings';
import { siteOpenIntervals, technicianShifts } from '../../shared/domain/shifts';
import { PlanSettingsSchema, type PlanSettings } from '../../shared/schemas/plan';

export const PLAN_SETTINGS_KEY = 'planning';

export async function readPlanSettings(db: DbOrTx): Promise<PlanSettings> {
  const [row] = await db.select().from(settings).where(eq(settings.key, PLAN_SETTINGS_KEY));
  const parsed = PlanSettingsSchema.safeParse(row?.value ?? {});
  return parsed.success ? parsed.data : PlanSettingsSchema.parse({});
}

/** The planner's time grid: starts fall on quarter hours. */
const QUARTER = 15 * 60_000;
const ceilQuarter = (ms: number) => Math.ceil(ms / QUARTER) * QUARTER;

export interface PlanScope {
  siteIds: string[];
  now: Date;
  /** Only these bikes' work is placed again; every other planned visit is kept as it is. */
  bikeIds?: string[];
  /** Leave out this visit (it is being moved): everything else is fixed. */
  movingVisitId?: string;
  /** Intervals (opening hours, shifts, bookings) over these instants instead of now … end of the horizon. */
  window?: { from: number; to: number };
}

export interface LoadedPlan {
  input: PlanInput;
  settings: PlanSettings;
  /** The planned visits the planner may replace (their tasks are in input.tasks). */
  replaceable: { id: string; bikeId: string; taskIds: string[] }[];
  /** Each site's first and last planned day. */
  days: Map<string, { first: string; last: string }>;
  taskInfo: Map<string, { itemName: string; dueDate: string | null; safetyCritical: boolean; minutes: number; status: string; bikeId: string }>;
}

interface TaskRow {
  id: string;
  bikeId: string;
  siteId: string;
  itemName: string;
  minutes: number;
  dueDate: string | null;
  safetyCritical: boolean;
  status: string;
  remainingKm: number | null;
  usageKmPerDay: number | null;
}

/**
 * Everything the planner needs for some sites, from now to the end of the horizon: opening hours,
 * bays, technicians' shifts, bikes with their bookings, model-at-site bookings, open tasks, and the
 * visits it must keep (started, planned for today, placed by a person, or, in a partial re-plan, every
 * visit of another bike).
 */
export async function loadPlanInput(db: DbOrTx, scope: PlanScope): Promise<LoadedPlan> {
  const settingsNow = await readPlanSettings(db);
  const siteRows = scope.siteIds.length
    ? await db.select({ id: sites.id, name: sites.name, timeZone: sites.timeZone }).from(sites).where(inArray(sites.id, scope.siteIds)).orderBy(asc(sites.name))
    : [];
  const siteIds = siteRows.map((s) => s.id);
  const nowMs = scope.now.getTime();
  let from = ceilQuarter(nowMs);
  const days = new Map<string, { first: string; last: string }>();
  const endOfToday = new Map<string, number>();
  let to = from;
  for (const s of siteRows) {
    const today = todayInZone(s.timeZone, scope.now);
    const last = addDaysIso(today, settingsNow.horizonDays - 1);
    days.set(s.id, { first: today, last });
    endOfToday.set(s.id, startOfDayInZone(addDaysIso(today, 1), s.timeZone));
    to = Math.max(to, startOfDayInZone(addDaysIso(last, 1), s.timeZone));
  }
  if (scope.window) {
    from = scope.window.from;
    to = scope.window.to;
  }
  const zoneOf = new Map(siteRows.map((s) => [s.id, s.timeZone]));
  const empty: LoadedPlan = {
    input: { from, to, sites: [], bays: [], technicians: [], bikes: [], demands: [], tasks: [], fixed: [], windowDays: settingsNow.windowDays, windowKm: settingsNow.windowKm },
    settings: settingsNow,
    replaceable: [],
    days,
    taskInfo: new Map(),
  };
  if (!siteIds.length) return empty;

  const hourRows = await db.select().from(siteHours).where(inArray(siteHours.siteId, siteIds));
  const planSites = siteRows.map((s) => ({
    id: s.id,
    name: s.name,
    timeZone: s.timeZone,
    open: siteOpenIntervals(hourRows.filter((h) => h.siteId === s.id), s.timeZone, from, to),
  }));
  const openOf = new Map(planSites.map((s) => [s.id, s.open]));

  const bayRows = await db.select({ id: bays.id, siteId: bays.siteId, name: bays.name }).from(bays).where(inArray(bays.siteId, siteIds)).orderBy(asc(bays.siteId), asc(bays.position), asc(bays.name));

  const patternRows = await db
    .select({ userId: workPatterns.userId, siteId: workPatterns.siteId, rrule: workPatterns.rrule, startsOn: workPatterns.startsOn, endsOn: workPatterns.endsOn, startTime: workPatterns.startTime, endTime: workPatterns.endTime, name: users.name })
    .from(workPatterns)
    .innerJoin(users, eq(users.id, workPatterns.userId))
    .where(and(inArray(workPatterns.siteId, siteIds), eq(users.role, 'technician'), eq(users.disabled, false)))
    .orderBy(asc(users.name), asc(users.id));
  const techIds = [...new Set(patternRows.map((p) => p.userId))];
  const offRows = techIds.length
    ? await db.select({ userId: timeOff.userId, firstDay: timeOff.firstDay, lastDay: timeOff.lastDay }).from(timeOff).where(inArray(timeOff.userId, techIds))
    : [];
  const technicians: PlanTechnician[] = [];
  for (const siteId of siteIds) {
    const mine = patternRows.filter((p) => p.siteId === siteId);
    for (const userId of [...new Set(mine.map((p) => p.userId))]) {
      const patterns = mine.filter((p) => p.userId === userId);
      technicians.push({
        id: userId,
        name: patterns[0].name,
        siteId,
        shifts: technicianShifts(patterns, offRows.filter((o) => o.userId === userId), openOf.get(siteId) ?? [], zoneOf.get(siteId)!, from, to),
      });
    }
  }

  const bikeRows = await db
    .select({ id: bikes.id, fleetNumber: bikes.fleetNumber, siteId: bikes.siteId, modelId: bikes.modelId, modelName: bikeModels.name, status: bikes.status })
    .from(bikes)
    .innerJoin(bikeModels, eq(bikeModels.id, bikes.modelId))
    .where(and(inArray(bikes.siteId, siteIds), ne(bikes.status, 'retired')))
    .orderBy(asc(bikes.fleetNumber));
  const bookingRows = await db
    .select()
    .from(bookings)
    .where(and(inArray(bookings.siteId, siteIds), lt(bookings.startAt, new Date(to)), or(sql`${bookings.rrule} is not null`, gt(bookings.endAt, new Date(from)))));
  const occurrences = bookingOccurrences(bookingRows, Object.fromEntries(zoneOf), from, to);
  const planBikes = new Map<string, PlanBike>(
    bikeRows.map((b) => [b.id, { id: b.id, fleetNumber: b.fleetNumber, siteId: b.siteId, modelId: b.modelId, modelName: b.modelName, available: b.status === 'in_service', bookings: [] }]),
  );
  const demands: ModelDemand[] = [];
  for (const o of occurrences) {
    if (o.bikeId) planBikes.get(o.bikeId)?.bookings.push({ bookingId: o.bookingId, kind: o.kind, title: o.title, start: o.start, end: o.end });
    else if (o.modelId) demands.push({ bookingId: o.bookingId, siteId: o.siteId, modelId: o.modelId, quantity: o.quantity, kind: o.kind, title: o.title, start: o.start, end: o.end });
  }

  // Visits still to come (or under way) at these sites, with their open tasks.
  const visitRows = await jsonRows<{ id: string; bikeId: string; siteId: string; bayId: string; technicianId: string; start: string; end: string; pinned: boolean; taskIds: string[] }>(
    db,
    sql`select v.id, v.bike_id as "bikeId", v.site_id as "siteId", v.bay_id as "bayId", v.technician_id as "technicianId",
               v.start_at as start, v.end_at as "end", v.pinned,
               coalesce((select json_agg(vt.task_id order by vt.task_id) from visit_tasks vt join service_tasks t on t.id = vt.task_id
                          where vt.visit_id = v.id and t.status in ('open', 'in_progress')), '[]'::json) as "taskIds"
          from visits v
         where v.site_id in (${sqlList(siteIds)}) and v.status = 'planned' and v.end_at > ${new Date(nowMs).toISOString()}`,
  );
  const onlyBikes = scope.bikeIds ? new Set(scope.bikeIds) : undefined;
  const fixed: FixedVisit[] = [];
  const replaceable: LoadedPlan['replaceable'] = [];
  const fixedTasks = new Set<string>();
  const movingTasks = new Set<string>();
  for (const v of visitRows) {
    const start = Date.parse(v.start);
    const end = Date.parse(v.end);
    if (v.id === scope.movingVisitId) {
      for (const t of v.taskIds) movingTasks.add(t);
      continue;
    }
    // Frozen: under way, planned for today, placed by a person, or (in a partial re-plan) another bike's.
    const frozen = scope.movingVisitId !== undefined || start < (endOfToday.get(v.siteId) ?? 0) || v.pinned || (onlyBikes !== undefined && !onlyBikes.has(v.bikeId));
    if (frozen && v.taskIds.length) {
      fixed.push({ id: v.id, bikeId: v.bikeId, siteId: v.siteId, bayId: v.bayId, technicianId: v.technicianId, start, end, taskIds: v.taskIds });
      for (const t of v.taskIds) fixedTasks.add(t);
    } else replaceable.push({ id: v.id, bikeId: v.bikeId, taskIds: v.taskIds });
  }

  const taskRows = await jsonRows<TaskRow>(
    db,
    sql`select t.id, t.bike_id as "bikeId", b.site_id as "siteId", i.name as "itemName", t.estimated_minutes as minutes,
               coalesce(t.due_date, d.due_date) as "dueDate", i.safety_critical as "safetyCritical", t.status,
               d.remaining_km as "remainingKm", d.usage_km_per_day as "usageKmPerDay"
          from service_tasks t
          join bikes b on b.id = t.bike_id
          join service_items i on i.id = t.service_item_id
          left join due_states d on d.bike_id = t.bike_id and d.service_item_id = t.service_item_id
         where b.site_id in (${sqlList(siteIds)}) and b.status <> 'retired' and t.status in ('open', 'in_progress')`,
    sql`q."bikeId", q.id`,
  );
  const taskInfo: LoadedPlan['taskInfo'] = new Map();
  const tasks: PlanTask[] = [];
  for (const t of taskRows) {
    taskInfo.set(t.id, { itemName: t.itemName, dueDate: t.dueDate, safetyCritical: t.safetyCritical, minutes: t.minutes, status: t.status, bikeId: t.bikeId });
    if (fixedTasks.has(t.id)) continue;
    if (onlyBikes && !onlyBikes.has(t.bikeId)) continue;
    // Moving one visit by hand: its tasks are the only ones to place.
    if (scope.movingVisitId && !movingTasks.has(t.id)) continue;
    const zone = zoneOf.get(t.siteId)!;
    // Work with no due date (raised by hand) is due by the end of the horizon.
    const dueDate = t.dueDate ?? days.get(t.siteId)!.last;
    tasks.push({
      id: t.id,
      bikeId: t.bikeId,
      itemName: t.itemName,
      minutes: Math.max(15, t.minutes),
      dueDate,
      deadline: startOfDayInZone(addDaysIso(dueDate, 1), zone),
      safetyCritical: t.safetyCritical,
      remainingKm: t.remainingKm,
      usageKmPerDay: t.usageKmPerDay,
    });
  }

  return {
    input: {
      from,
      to,
      sites: planSites,
      bays: bayRows,
      technicians,
      bikes: [...planBikes.values()],
      demands,
      tasks,
      fixed,
      windowDays: settingsNow.windowDays,
      windowKm: settingsNow.windowKm,
    },
    settings: settingsNow,
    replaceable: onlyBikes ? replaceable.filter((r) => onlyBikes.has(r.bikeId)) : replaceable,
    days,
    taskInfo,
  };
}
