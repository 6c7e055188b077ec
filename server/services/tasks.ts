import { and, asc, desc, eq, inArray, ne, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Db, DbOrTx, Tx } from '../db/client';
import { bikeModels, bikes, odometerReadings, serviceItems, serviceRecords, serviceTasks, sites, userSites, users } from '../db/schema';
import type { SessionUser } from '../../shared/schemas/auth';
import type { Task, TaskListQuery } from '../../shared/schemas/tasks';
import { canSeeSite } from '../../shared/domain/policies';
import { todayInZone } from '../../shared/domain/dates';
import { toKm } from '../../shared/domain/units';
import { audit } from '../audit';
import { HttpError, badRequest, conflict, notFound } from '../http-error';
import { recomputeBike } from './due';
import { replanAfter } from './replan';
import { settleVisitsOfBike } from './workshop-plan';
import { bookPartsUsed } from './parts';
import type { PartsUsed } from '../../shared/schemas/parts';

const assignee = alias(users, 'task_assignee');

export async function listTasks(db: DbOrTx, user: SessionUser, q: Partial<TaskListQuery> & { ids?: string[] }): Promise<Task[]> {
  if (!user.siteIds.length) return [];
  const where: SQL[] = [inArray(bikes.siteId, user.siteIds)];
  const status = q.ids ? 'any' : (q.status ?? 'active');
  if (status === 'any') {
    // Looking up given tasks: whatever their state.
  } else if (status === 'active') where.push(inArray(serviceTasks.status, ['open', 'in_progress']));
  else where.push(eq(serviceTasks.status, status));
  if (q.mine === '1') where.push(eq(serviceTasks.assigneeId, user.id));
  if (q.siteId) where.push(eq(bikes.siteId, q.siteId));
  if (q.bikeId) where.push(eq(serviceTasks.bikeId, q.bikeId));
  if (q.ids) where.push(inArray(serviceTasks.id, q.ids));
  const rows = await db
    .select({
      t: serviceTasks,
      fleetNumber: bikes.fleetNumber,
      siteId: bikes.siteId,
      bikeStatus: bikes.status,
      siteName: sites.name,
      modelName: bikeModels.name,
      item: { name: serviceItems.name, category: serviceItems.category, safetyCritical: serviceItems.safetyCritical },
      assigneeName: assignee.name,
    })
    .from(serviceTasks)
    .innerJoin(bikes, eq(bikes.id, serviceTasks.bikeId))
    .innerJoin(sites, eq(sites.id, bikes.siteId))
    .innerJoin(bikeModels, eq(bikeModels.id, bikes.modelId))
    .innerJoin(serviceItems, eq(serviceItems.id, serviceTasks.serviceItemId))
    .leftJoin(assignee, eq(assignee.id, serviceTasks.assigneeId))
    .where(and(...where))
    .orderBy(sql`${serviceTasks.dueDate} asc nulls last`, asc(bikes.fleetNumber))
    .limit(1000);
  return rows.map((r) => ({
    id: r.t.id,
    bikeId: r.t.bikeId,
    fleetNumber: r.fleetNumber,
    siteId: r.siteId,
    siteName: r.siteName,
    modelName: r.modelName,
    itemId: r.t.serviceItemId,
    item: r.item.name,
    category: r.item.category,
    safetyCritical: r.item.safetyCritical,
    status: r.t.status,
    origin: r.t.origin,
    dueDate: r.t.dueDate,
    estimatedMinutes: r.t.estimatedMinutes,
    assignee: r.t.assigneeId ? { id: r.t.assigneeId, name: r.assigneeName ?? '' } : null,
    bikeStatus: r.bikeStatus,
    raisedAt: r.t.raisedAt.toISOString(),
    startedAt: r.t.startedAt?.toISOString() ?? null,
    closedAt: r.t.closedAt?.toISOString() ?? null,
    version: r.t.version,
  }));
}

export async function getTask(db: DbOrTx, user: SessionUser, id: string) {
  const [t] = await listTasks(db, user, { ids: [id] });
  return t ?? null;
}

/** The task row locked for a change, after the site check: another site's task is not found. */
async function lockTask(tx: Tx, user: SessionUser, id: string) {
  const [row] = await tx
    .select({ t: serviceTasks, siteId: bikes.siteId, bikeStatus: bikes.status, timeZone: sites.timeZone, category: serviceItems.category, itemName: serviceItems.name })
    .from(serviceTasks)
    .innerJoin(bikes, eq(bikes.id, serviceTasks.bikeId))
    .innerJoin(sites, eq(sites.id, bikes.siteId))
    .innerJoin(serviceItems, eq(serviceItems.id, serviceTasks.serviceItemId))
    .where(eq(serviceTasks.id, id))
    .for('update', { of: serviceTasks });
  if (!row || !canSeeSite(user, row.siteId)) throw notFound('That task');
  return row;
}

const closedAlready = (status: string) =>
  conflict(status === 'done' ? 'This task is already signed off, perhaps by someone else. Reload to see who.' : 'This task was withdrawn. Reload the list.');

export async function assignTask(db: Db, user: SessionUser, id: string, assigneeId: string | null) {
  await db.transaction(async (tx) => {
    const row = await lockTask(tx, user, id);
    if (row.t.status === 'done' || row.t.status === 'cancelled') throw closedAlready(row.t.status);
    if (assigneeId) {
      const [tech] = await tx
        .select({ id: users.id })
        .from(users)
        .innerJoin(userSites, eq(userSites.userId, users.id))
        .where(and(eq(users.id, assigneeId), eq(users.role, 'technician'), eq(users.disabled, false), eq(userSites.siteId, row.siteId)));
      if (!tech) throw badRequest('Choose a technician who works at the bike’s site.', [{ path: 'assigneeId', message: 'Not a technician of this site.' }]);
    }
    await tx.update(serviceTasks).set({ assigneeId, version: sql`${serviceTasks.version} + 1` }).where(eq(serviceTasks.id, id));
    await audit(tx, { userId: user.id, action: 'assign', entity: 'task', entityId: id, changes: { assigneeId: [row.t.assigneeId, assigneeId] } });
  });
}

/** Starting work takes the bike into the workshop. */
export async function startTask(db: Db, user: SessionUser, id: string, now: Date) {
  await db.transaction(async (tx) => {
    const row = await lockTask(tx, user, id);
    if (row.t.status !== 'open') throw row.t.status === 'in_progress' ? conflict('This task is already on the bench.') : closedAlready(row.t.status);
    await tx.update(serviceTasks).set({ status: 'in_progress', startedAt: now, version: sql`${serviceTasks.version} + 1`, assigneeId: row.t.assigneeId ?? (user.role === 'technician' ? user.id : null) }).where(eq(serviceTasks.id, id));
    if (row.bikeStatus === 'in_service') await tx.update(bikes).set({ status: 'in_workshop', updatedAt: now }).where(eq(bikes.id, row.t.bikeId));
    await audit(tx, { userId: user.id, action: 'start', entity: 'task', entityId: id });
  });
}

export interface CloseInput {
  version: number;
  date?: string;
  notes?: string;
  /** What the service took from the shelf. */
  parts?: PartsUsed;
}

/**
 * Signs a task off: records the service as done (date, odometer) so the next cycle starts, releases
 * the bike from the workshop when nothing else is on the bench, and recomputes its dues.
 * `extra` writes what a particular kind of task records (valve readings, shim stock) in the same transaction.
 */
export async function closeTask(db: Db, user: SessionUser, id: string, input: CloseInput, now: Date, extra?: (tx: Tx, ctx: { taskId: string; bikeId: string; siteId: string; date: string; odometerKm: number; recordId: string }) => Promise<void>, fromValveCard = false) {
  const closed = await db.transaction(async (tx) => {
    const row = await lockTask(tx, user, id);
    if (row.t.status === 'done' || row.t.status === 'cancelled') throw closedAlready(row.t.status);
    if (row.t.version !== input.version) throw conflict('Someone changed this task while you worked on it. Reload it; your readings are kept on this device.');
    if ((row.category === 'valves') !== fromValveCard) throw new HttpError(409, 'conflict', fromValveCard ? 'This is not a valve clearance task.' : 'A valve clearance task is closed from its task card, with a reading for every valve.');
    const today = todayInZone(row.timeZone, now);
    const date = input.date ?? today;
    if (date > today) throw badRequest('The date is after today.', [{ path: 'date', message: 'In the future.' }]);
    const [latest] = await tx.select({ km: odometerReadings.odometerKm }).from(odometerReadings).where(eq(odometerReadings.bikeId, row.t.bikeId)).orderBy(desc(odometerReadings.odometerKm)).limit(1);
    const [bike] = await tx.select().from(bikes).where(eq(bikes.id, row.t.bikeId));
    const odometerKm = latest?.km ?? toKm(bike.inServiceOdometer, bike.odometerUnit);
    const [record] = await tx
      .insert(serviceRecords)
      .values({ bikeId: row.t.bikeId, serviceItemId: row.t.serviceItemId, date, odometerKm, taskId: id, doneBy: user.id, notes: input.notes ?? null })
      .returning({ id: serviceRecords.id });
    await extra?.(tx, { taskId: id, bikeId: row.t.bikeId, siteId: row.siteId, date, odometerKm, recordId: record.id });
    if (input.parts?.length) await bookPartsUsed(tx, { siteId: row.siteId, taskId: id, what: `${bike.fleetNumber}, ${row.itemName}`, lines: input.parts, by: user.id, at: now });
    await tx.update(serviceTasks).set({ status: 'done', closedAt: now, closedBy: user.id, version: sql`${serviceTasks.version} + 1` }).where(eq(serviceTasks.id, id));
    // Other open tasks for the same item are met by this service.
    await tx
      .update(serviceTasks)
      .set({ status: 'cancelled', closedAt: now, closedBy: user.id, note: 'Met by another task', version: sql`${serviceTasks.version} + 1` })
      .where(and(eq(serviceTasks.bikeId, row.t.bikeId), eq(serviceTasks.serviceItemId, row.t.serviceItemId), ne(serviceTasks.id, id), inArray(serviceTasks.status, ['open', 'in_progress'])));
    const [stillOnBench] = await tx.select({ id: serviceTasks.id }).from(serviceTasks).where(and(eq(serviceTasks.bikeId, row.t.bikeId), eq(serviceTasks.status, 'in_progress'))).limit(1);
    // Conditional on the state now: a reading taken on this task may just have grounded the bike.
    if (!stillOnBench) await tx.update(bikes).set({ status: 'in_service', updatedAt: now }).where(and(eq(bikes.id, row.t.bikeId), eq(bikes.status, 'in_workshop')));
    await audit(tx, { userId: user.id, action: 'close', entity: 'task', entityId: id, changes: { date, odometerKm, notes: input.notes ?? null } });
    await recomputeBike(tx, row.t.bikeId, now);
    // A visit with nothing left open in it is over; the next re-plan places what the bike still needs.
    await settleVisitsOfBike(tx, row.t.bikeId, now);
    return { recordId: record.id, bikeId: row.t.bikeId, siteId: row.siteId };
  });
  await replanAfter(db, { siteIds: [closed.siteId], bikeIds: [closed.bikeId], why: 'task signed off' }, now);
  return { recordId: closed.recordId };
}

export async function assignableTechnicians(db: DbOrTx, user: SessionUser) {
  if (!user.siteIds.length) return [];
  const rows = await db
    .select({ id: users.id, name: users.name, siteId: userSites.siteId })
    .from(users)
    .innerJoin(userSites, eq(userSites.userId, users.id))
    .where(and(eq(users.role, 'technician'), eq(users.disabled, false), inArray(userSites.siteId, user.siteIds)))
    .orderBy(asc(users.name));
  const open = await db
    .select({ id: serviceTasks.assigneeId, minutes: sql<number>`sum(${serviceTasks.estimatedMinutes})::int` })
    .from(serviceTasks)
    .where(inArray(serviceTasks.status, ['open', 'in_progress']))
    .groupBy(serviceTasks.assigneeId);
  const minutes = new Map(open.map((o) => [o.id, Number(o.minutes)]));
  const by = new Map<string, { id: string; name: string; siteIds: string[]; openMinutes: number }>();
  for (const r of rows) {
    const e = by.get(r.id) ?? { id: r.id, name: r.name, siteIds: [], openMinutes: minutes.get(r.id) ?? 0 };
    e.siteIds.push(r.siteId);
    by.set(r.id, e);
  }
  return [...by.values()];
}
