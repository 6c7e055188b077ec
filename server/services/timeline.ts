import { and, desc, eq, inArray } from 'drizzle-orm';
import type { Db } from '../db/client';
import { auditLog, defects, odometerReadings, serviceItems, serviceRecords, serviceTasks, users, valveChecks } from '../db/schema';

export interface TimelineEvent {
  at: string;
  kind: 'check-in' | 'odometer-replaced' | 'defect' | 'task-raised' | 'task-closed' | 'service' | 'valve-check' | 'status';
  title: string;
  detail: string | null;
  by: string | null;
}

const iso = (d: Date) => d.toISOString();
// A record dated some other day than it was typed in (an import, a late entry) sorts by its own date.
const when = (date: string, created: Date) => (iso(created).startsWith(date) ? iso(created) : `${date}T12:00:00.000Z`);
const fmtKm = (km: number) => `${Math.round(km).toLocaleString('en-GB')} km`;

/**
 * A bike's story in order, newest first: check-ins, defects, work raised and done, readings, state changes.
 * Takes the database, never a transaction: its reads go out together, each on a connection of its own on PostgreSQL.
 */
export async function bikeTimeline(db: Db, bikeId: string, limit = 300): Promise<TimelineEvent[]> {
  const names = new Map<string, string>();
  const person = (id: string | null) => (id ? (names.get(id) ?? null) : null);
  const [readings, defs, tasks, records, checks, audits] = await Promise.all([
    db.select().from(odometerReadings).where(eq(odometerReadings.bikeId, bikeId)).orderBy(desc(odometerReadings.createdAt)).limit(limit),
    db.select().from(defects).where(eq(defects.bikeId, bikeId)).orderBy(desc(defects.reportedAt)).limit(limit),
    db.select({ t: serviceTasks, item: serviceItems.name }).from(serviceTasks).innerJoin(serviceItems, eq(serviceItems.id, serviceTasks.serviceItemId)).where(eq(serviceTasks.bikeId, bikeId)).orderBy(desc(serviceTasks.raisedAt)).limit(limit),
    db.select({ r: serviceRecords, item: serviceItems.name }).from(serviceRecords).innerJoin(serviceItems, eq(serviceItems.id, serviceRecords.serviceItemId)).where(eq(serviceRecords.bikeId, bikeId)).orderBy(desc(serviceRecords.date)).limit(limit),
    db.select().from(valveChecks).where(eq(valveChecks.bikeId, bikeId)).orderBy(desc(valveChecks.date)).limit(limit),
    db.select().from(auditLog).where(and(eq(auditLog.entity, 'bike'), eq(auditLog.entityId, bikeId), inArray(auditLog.action, ['status', 'grounded', 'create', 'update']))).orderBy(desc(auditLog.at)).limit(limit),
  ]);
  const ids = [...new Set([...readings.map((r) => r.recordedBy), ...defs.map((d) => d.reportedBy), ...tasks.map((t) => t.t.closedBy), ...records.map((r) => r.r.doneBy), ...audits.map((a) => a.userId)].filter((x): x is string => !!x))];
  if (ids.length) for (const u of await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids))) names.set(u.id, u.name);

  const events: TimelineEvent[] = [];
  for (const r of readings)
    events.push({ at: when(r.date, r.createdAt), kind: r.reset ? 'odometer-replaced' : 'check-in', title: r.reset ? `New odometer fitted, reading ${r.value} ${r.unit}` : `Odometer ${r.value.toLocaleString('en-GB')} ${r.unit}`, detail: `${r.date} · ${fmtKm(r.odometerKm)} in service · ${r.source}`, by: person(r.recordedBy) });
  for (const d of defs)
    events.push({ at: iso(d.reportedAt), kind: 'defect', title: `Defect reported: ${d.category}${d.safetyCritical ? ' (safety-critical)' : ''}`, detail: d.text, by: person(d.reportedBy) });
  for (const { t, item } of tasks) {
    events.push({ at: iso(t.raisedAt), kind: 'task-raised', title: `Work raised: ${item}`, detail: t.origin === 'trend' ? 'Early, for a closing valve' : t.dueDate ? `Due ${t.dueDate}` : null, by: null });
    if (t.closedAt) events.push({ at: iso(t.closedAt), kind: 'task-closed', title: `${t.status === 'done' ? 'Signed off' : 'Withdrawn'}: ${item}`, detail: t.note, by: person(t.closedBy) });
  }
  for (const { r, item } of records)
    events.push({ at: `${r.date}T12:00:00.000Z`, kind: 'service', title: `Service done: ${item}`, detail: `${r.date} at ${fmtKm(r.odometerKm)}${r.notes ? ` · ${r.notes}` : ''}`, by: person(r.doneBy) });
  for (const c of checks)
    events.push({ at: when(c.date, c.createdAt), kind: 'valve-check', title: 'Valve clearances measured', detail: `${c.date} at ${fmtKm(c.odometerKm)}`, by: person(c.checkedBy) });
  for (const a of audits) {
    const ch = (a.changes ?? {}) as { status?: [string, string]; reason?: string | [string, string] };
    if (a.action === 'status' || a.action === 'grounded')
      events.push({ at: iso(a.at), kind: 'status', title: `State: ${ch.status?.[1]?.replace(/_/g, ' ') ?? 'changed'}`, detail: Array.isArray(ch.reason) ? ch.reason[1] : (ch.reason ?? null), by: person(a.userId) ?? (a.userId ? null : 'Lashline') });
  }
  return events.sort((a, b) => (a.at < b.at ? 1 : a.at > b.at ? -1 : 0)).slice(0, limit);
}
