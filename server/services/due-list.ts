import { sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';
import { jsonRows, jsonTuples, sqlList } from '../db/json-rows';
import type { ComputedDue } from './due';
import type { BikeSummary } from '../../shared/schemas/bikes';
import type { DueItem, DueQuery } from '../../shared/schemas/due';
import { fromKm } from '../../shared/domain/units';
import { addDaysIso, todayInZone } from '../../shared/domain/dates';

export interface DueFilter extends Partial<DueQuery> {
  bikeId?: string;
  /** Every item, fine ones included (a bike's own page). */
  all?: boolean;
}

/** A due item as the query gives it: everything but the distance in the bike's unit, plus what the window cut needs. */
type DueRow = Omit<DueItem, 'remainingInUnit'> & { timeZone: string; n: number };

/**
 * The stored due states as the screens list them: overdue first, then by due date, then fleet
 * number (then item, by id, to make the order total); with the open task (the oldest, if there are two) and who has it.
 */
export async function listDue(db: DbOrTx, siteIds: string[], f: DueFilter, now: Date): Promise<DueItem[]> {
  if (!siteIds.length) return [];
  const where: SQL[] = [sql`b.site_id in (${sqlList(siteIds)})`, sql`b.status <> 'retired'`];
  if (f.bikeId) where.push(sql`b.id = ${f.bikeId}`);
  if (f.siteId) where.push(sql`b.site_id = ${f.siteId}`);
  if (f.modelId) where.push(sql`b.model_id = ${f.modelId}`);
  if (f.status) where.push(sql`d.status = ${f.status}`);
  if (f.item) where.push(sql`i.name = ${f.item}`);
  const within = f.within ?? 7;
  // The window in SQL, a day wide of any site's calendar; the exact per-site cut is made below.
  if (!f.all) where.push(sql`(d.status = 'overdue' or d.due_date <= ${addDaysIso(todayInZone('UTC', now), within + 1)})`);
  const rows = await jsonRows<DueRow>(
    db,
    sql`select b.id as "bikeId", b.fleet_number as "fleetNumber", b.site_id as "siteId", s.name as "siteName", s.time_zone as "timeZone",
               m.name as "modelName", i.id as "itemId", i.name as item, i.category, i.safety_critical as "safetyCritical",
               d.status, d.due_date as "dueDate", d.due_at_km as "dueAtKm", d.due_by_date as "dueByDate", d.trigger,
               d.remaining_km as "remainingKm", d.remaining_days as "remainingDays", d.usage_km_per_day as "usageKmPerDay",
               b.odometer_unit as "odometerUnit", d.baseline_date as "lastDoneDate", b.status as "bikeStatus", t.id as "taskId",
               case when u.id is null then null else json_build_object('id', u.id, 'name', u.name) end as assignee,
               row_number() over (order by d.status = 'overdue' desc, d.due_date asc, b.fleet_number asc, d.service_item_id asc) as n
          from due_states d
          join bikes b on b.id = d.bike_id
          join sites s on s.id = b.site_id
          join bike_models m on m.id = b.model_id
          join service_items i on i.id = d.service_item_id
          left join lateral (select t.id, t.assignee_id from service_tasks t
                              where t.bike_id = d.bike_id and t.service_item_id = d.service_item_id
                                and t.status in ('open', 'in_progress')
                              order by t.raised_at, t.id limit 1) t on true
          left join users u on u.id = t.assignee_id
         where ${sql.join(where, sql` and `)}`,
    sql`q.n`,
  );

  const limits = new Map<string, string>();
  const limitIn = (zone: string) => limits.get(zone) ?? limits.set(zone, addDaysIso(todayInZone(zone, now), within)).get(zone)!;
  const out: DueItem[] = [];
  for (const { timeZone, n: _order, ...r } of rows) {
    if (!f.all && r.status !== 'overdue' && (!r.dueDate || r.dueDate > limitIn(timeZone))) continue;
    out.push({ ...r, remainingInUnit: r.remainingKm == null ? null : fromKm(r.remainingKm, r.odometerUnit) });
  }
  return out;
}

type OpenTask = { id: string; assigneeId: string | null; assigneeName: string | null };

/** The open task of each item (the oldest, if there are two), per bike. */
export async function openTasks(db: DbOrTx, bikeIds: string[]): Promise<Map<string, Map<string, OpenTask>>> {
  const out = new Map<string, Map<string, OpenTask>>(bikeIds.map((id) => [id, new Map()]));
  if (!bikeIds.length) return out;
  const rows = await jsonTuples<[string, string, string, string | null, string | null]>(
    db,
    sql`select json_build_array(t.bike_id, t.service_item_id, t.id, u.id, u.name) as a, t.raised_at, t.id
          from service_tasks t left join users u on u.id = t.assignee_id
         where t.bike_id in (${sqlList(bikeIds)}) and t.status in ('open', 'in_progress')`,
    sql`q.raised_at desc, q.id desc`,
  );
  // Latest first, so the oldest open task of an item is the one kept, as in listDue.
  for (const [bikeId, itemId, id, assigneeId, assigneeName] of rows) out.get(bikeId)?.set(itemId, { id, assigneeId, assigneeName });
  return out;
}

/** One bike's due items from a computation just stored, in listDue's order and shape. */
export function dueItemsOf(bike: BikeSummary, computed: ComputedDue[], tasks: Map<string, OpenTask>): DueItem[] {
  const rank = (c: ComputedDue) => (c.result.status === 'overdue' ? 0 : 1);
  const ordered = computed
    .filter((c) => c.bikeId === bike.id)
    .sort((a, b) => rank(a) - rank(b) || compareDue(a.result.dueDate, b.result.dueDate) || (a.item.id < b.item.id ? -1 : a.item.id > b.item.id ? 1 : 0));
  return ordered.map(({ item, result: r }) => {
    const task = tasks.get(item.id);
    return {
      bikeId: bike.id,
      fleetNumber: bike.fleetNumber,
      siteId: bike.site.id,
      siteName: bike.site.name,
      modelName: bike.model.name,
      itemId: item.id,
      item: item.name,
      category: item.category,
      safetyCritical: item.safetyCritical,
      status: r.status,
      dueDate: r.dueDate,
      dueAtKm: r.dueAtKm,
      dueByDate: r.dueByDate,
      trigger: r.trigger,
      remainingKm: r.remainingKm,
      remainingDays: r.remainingDays,
      usageKmPerDay: r.usageKmPerDay,
      odometerUnit: bike.odometerUnit,
      remainingInUnit: r.remainingKm == null ? null : fromKm(r.remainingKm, bike.odometerUnit),
      lastDoneDate: r.baseline.date,
      bikeStatus: bike.status,
      taskId: task?.id ?? null,
      assignee: task?.assigneeId ? { id: task.assigneeId, name: task.assigneeName! } : null,
    };
  });
}

/**
 * One bike's due items straight from the computation just stored (a check-in's answer), without
 * reading the states back: only its open tasks are read.
 */
export async function dueItemsFromComputed(db: DbOrTx, bike: BikeSummary, computed: ComputedDue[]): Promise<DueItem[]> {
  return dueItemsOf(bike, computed, (await openTasks(db, [bike.id])).get(bike.id)!);
}

/** SQL's ascending order of dates, nulls last. */
const compareDue = (a: string | null, b: string | null) => (a === b ? 0 : a === null ? 1 : b === null ? -1 : a < b ? -1 : 1);
