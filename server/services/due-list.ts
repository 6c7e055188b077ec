import { and, asc, desc, eq, inArray, lte, or, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { DbOrTx } from '../db/client';
import { bikeModels, bikes, dueStates, serviceItems, serviceTasks, sites, users } from '../db/schema';
import type { DueItem, DueQuery } from '../../shared/schemas/due';
import { fromKm } from '../../shared/domain/units';
import { addDaysIso, todayInZone } from '../../shared/domain/dates';

export interface DueFilter extends Partial<DueQuery> {
  bikeId?: string;
  /** Every item, fine ones included (a bike's own page). */
  all?: boolean;
}

const assignee = alias(users, 'assignee');

/** The stored due states as the screens list them: overdue first, then by due date. */
export async function listDue(db: DbOrTx, siteIds: string[], f: DueFilter, now: Date): Promise<DueItem[]> {
  if (!siteIds.length) return [];
  const where: SQL[] = [inArray(bikes.siteId, siteIds), sql`${bikes.status} <> 'retired'`];
  if (f.bikeId) where.push(eq(bikes.id, f.bikeId));
  if (f.siteId) where.push(eq(bikes.siteId, f.siteId));
  if (f.modelId) where.push(eq(bikes.modelId, f.modelId));
  if (f.status) where.push(eq(dueStates.status, f.status));
  if (f.item) where.push(eq(serviceItems.name, f.item));
  // The window in SQL, a day wide of any site's calendar; the exact per-site cut is made below.
  if (!f.all) where.push(or(eq(dueStates.status, 'overdue'), lte(dueStates.dueDate, addDaysIso(todayInZone('UTC', now), (f.within ?? 7) + 1)))!);
  const rows = await db
    .select({
      d: dueStates,
      bike: { id: bikes.id, fleetNumber: bikes.fleetNumber, unit: bikes.odometerUnit, status: bikes.status, siteId: bikes.siteId },
      siteName: sites.name,
      timeZone: sites.timeZone,
      modelName: bikeModels.name,
      item: { id: serviceItems.id, name: serviceItems.name, category: serviceItems.category, safetyCritical: serviceItems.safetyCritical },
      taskId: serviceTasks.id,
      assigneeId: assignee.id,
      assigneeName: assignee.name,
    })
    .from(dueStates)
    .innerJoin(bikes, eq(bikes.id, dueStates.bikeId))
    .innerJoin(sites, eq(sites.id, bikes.siteId))
    .innerJoin(bikeModels, eq(bikeModels.id, bikes.modelId))
    .innerJoin(serviceItems, eq(serviceItems.id, dueStates.serviceItemId))
    .leftJoin(
      serviceTasks,
      and(
        eq(serviceTasks.bikeId, dueStates.bikeId),
        eq(serviceTasks.serviceItemId, dueStates.serviceItemId),
        inArray(serviceTasks.status, ['open', 'in_progress']),
      ),
    )
    .leftJoin(assignee, eq(assignee.id, serviceTasks.assigneeId))
    .where(and(...where))
    .orderBy(desc(sql`${dueStates.status} = 'overdue'`), asc(dueStates.dueDate), asc(bikes.fleetNumber));

  const out: DueItem[] = [];
  const seen = new Set<string>();
  for (const r of rows) {
    const key = `${r.d.bikeId}:${r.d.serviceItemId}`;
    if (seen.has(key)) continue;
    seen.add(key);
    if (!f.all && r.d.status !== 'overdue') {
      const limit = addDaysIso(todayInZone(r.timeZone, now), f.within ?? 7);
      if (!r.d.dueDate || r.d.dueDate > limit) continue;
    }
    const unit = r.bike.unit;
    out.push({
      bikeId: r.bike.id,
      fleetNumber: r.bike.fleetNumber,
      siteId: r.bike.siteId,
      siteName: r.siteName,
      modelName: r.modelName,
      itemId: r.item.id,
      item: r.item.name,
      category: r.item.category,
      safetyCritical: r.item.safetyCritical,
      status: r.d.status,
      dueDate: r.d.dueDate,
      dueAtKm: r.d.dueAtKm,
      dueByDate: r.d.dueByDate,
      trigger: r.d.trigger,
      remainingKm: r.d.remainingKm,
      remainingDays: r.d.remainingDays,
      usageKmPerDay: r.d.usageKmPerDay,
      odometerUnit: unit,
      remainingInUnit: r.d.remainingKm == null ? null : fromKm(r.d.remainingKm, unit),
      lastDoneDate: r.d.baselineDate,
      bikeStatus: r.bike.status,
      taskId: r.taskId,
      assignee: r.assigneeId ? { id: r.assigneeId, name: r.assigneeName! } : null,
    });
  }
  return out;
}
