import { and, eq, inArray, sql } from 'drizzle-orm';
import type { DbOrTx as Writer } from '../db/client';
import { auditLog, serviceTasks, userSites, users } from '../db/schema';
import { computeDue, type DueResult } from '../../shared/domain/due';
import { toKm } from '../../shared/domain/units';
import { usageRate } from '../../shared/domain/usage';
import { doneKey, loadDueInputs, type DueInputs } from './due-data';
import { uuidArray } from '../db/json-rows';


export interface ComputedDue {
  bikeId: string;
  siteId: string;
  /** The bike's site calendar date the computation was made for. */
  today: string;
  item: DueInputs['itemsByModel'] extends Map<string, (infer I)[]> ? I : never;
  result: DueResult;
}

/** computeDue for every bike × service item in the inputs; pure after loading. */
export function computeAll(inputs: DueInputs): ComputedDue[] {
  const out: ComputedDue[] = [];
  for (const b of inputs.bikes) {
    const inService = { date: b.inServiceDate, odometerKm: toKm(b.inServiceOdometer, b.odometerUnit) };
    const readings = inputs.readings.get(b.id) ?? [];
    const usageKmPerDay = usageRate(readings, b.today);
    for (const item of inputs.itemsByModel.get(b.modelId) ?? []) {
      const result = computeDue({
        interval: { everyKm: item.everyKm, everyMonths: item.everyMonths, firstAtKm: item.firstAtKm, rrule: item.rrule },
        lastDone: inputs.lastDone.get(doneKey(b.id, item.id)) ?? null,
        inService,
        readings,
        today: b.today,
        usageKmPerDay,
      });
      out.push({ bikeId: b.id, siteId: b.siteId, today: b.today, item, result });
    }
  }
  return out;
}

const cycleKey = (r: DueResult) => `${r.baseline.kind}:${r.baseline.date}:${Math.round(r.baseline.odometerKm)}`;

/** The stored columns of a due state, with their SQL types, in the order the statement lists them. */
const STATE_COLUMNS = [
  ['status', 'text'],
  ['due_at_km', 'double precision'],
  ['due_by_date', 'date'],
  ['projected_date_for_km', 'date'],
  ['due_date', 'date'],
  ['trigger', 'text'],
  ['current_km', 'double precision'],
  ['remaining_km', 'double precision'],
  ['remaining_days', 'integer'],
  ['usage_km_per_day', 'double precision'],
  ['baseline_date', 'date'],
  ['baseline_km', 'double precision'],
] as const;
const STATE_NAMES = STATE_COLUMNS.map(([c]) => c).join(', ');
const STATE_RECORD = `bike_id uuid, service_item_id uuid, ${STATE_COLUMNS.map(([c, t]) => `${c} ${t}`).join(', ')}`;
const STATE_UPDATE = STATE_COLUMNS.map(([c]) => `${c} = excluded.${c}`).join(', ');
const STATE_CHANGED = `(${STATE_COLUMNS.map(([c]) => `due_states.${c}`).join(', ')}) is distinct from (${STATE_COLUMNS.map(([c]) => `excluded.${c}`).join(', ')})`;

/**
 * Stores the due states in one statement per few thousand rows, handed over as one JSON parameter;
 * a row whose values did not change is left alone (computed_at says when it last changed).
 */
async function saveStates(db: Writer, computed: ComputedDue[], now: Date) {
  for (let i = 0; i < computed.length; i += 5000) {
    const rows = computed.slice(i, i + 5000).map(({ bikeId, item, result: r }) => ({
      bike_id: bikeId,
      service_item_id: item.id,
      status: r.status,
      due_at_km: r.dueAtKm,
      due_by_date: r.dueByDate,
      projected_date_for_km: r.projectedDateForKm,
      due_date: r.dueDate,
      trigger: r.trigger,
      current_km: r.currentKm,
      remaining_km: r.remainingKm,
      remaining_days: r.remainingDays,
      usage_km_per_day: r.usageKmPerDay,
      baseline_date: r.baseline.date,
      baseline_km: r.baseline.odometerKm,
    }));
    await db.execute(sql`
      insert into due_states (bike_id, service_item_id, ${sql.raw(STATE_NAMES)}, computed_at)
      select bike_id, service_item_id, ${sql.raw(STATE_NAMES)}, ${now.toISOString()}::timestamptz
        from jsonb_to_recordset(${JSON.stringify(rows)}::jsonb) as x(${sql.raw(STATE_RECORD)})
      on conflict (bike_id, service_item_id) do update set ${sql.raw(STATE_UPDATE)}, computed_at = excluded.computed_at
      where ${sql.raw(STATE_CHANGED)}`);
  }
}

/** Open minutes of work per technician, for giving new work to the least loaded one at the bike's site. */
async function technicianLoads(db: Writer, siteIds: string[]) {
  if (!siteIds.length) return new Map<string, { userId: string; minutes: number }[]>();
  const techs = await db
    .select({ userId: users.id, siteId: userSites.siteId })
    .from(users)
    .innerJoin(userSites, eq(userSites.userId, users.id))
    .where(and(eq(users.role, 'technician'), eq(users.disabled, false), inArray(userSites.siteId, siteIds)));
  const open = await db
    .select({ assigneeId: serviceTasks.assigneeId, minutes: sql<number>`sum(${serviceTasks.estimatedMinutes})::int` })
    .from(serviceTasks)
    .where(inArray(serviceTasks.status, ['open', 'in_progress']))
    .groupBy(serviceTasks.assigneeId);
  const minutes = new Map(open.map((o) => [o.assigneeId, Number(o.minutes)]));
  const bySite = new Map<string, { userId: string; minutes: number }[]>();
  for (const t of techs) bySite.set(t.siteId, [...(bySite.get(t.siteId) ?? []), { userId: t.userId, minutes: minutes.get(t.userId) ?? 0 }]);
  return bySite;
}

function pickTechnician(pool: { userId: string; minutes: number }[] | undefined, minutes: number) {
  if (!pool?.length) return null;
  const best = pool.reduce((a, b) => (b.minutes < a.minutes || (b.minutes === a.minutes && b.userId < a.userId) ? b : a));
  best.minutes += minutes;
  return best.userId;
}

export interface ApplyReport {
  computed: number;
  tasksRaised: number;
  /** Valve checks brought forward for bikes with a closing valve (counted apart from tasksRaised). */
  earlyValveChecks: number;
  bikesGrounded: number;
}

/**
 * Stores the due states, raises one task per item and due cycle that is overdue or soon (the unique
 * cycle key makes a repeat, a concurrent run or a restart raise nothing twice), brings the valve
 * check forward on bikes whose valves close up too fast (`closingValveBikes`: the scan passes the
 * bikes with a valve warning), and grounds bikes with an overdue safety-critical item.
 */
export async function applyDue(db: Writer, computed: ComputedDue[], now: Date, closingValveBikes?: ReadonlySet<string>): Promise<ApplyReport> {
  await saveStates(db, computed, now);
  const wanted = computed.filter((c) => c.result.status !== 'ok');
  const work: WorkToRaise[] = wanted.map((c) => ({ due: c, cycleKey: cycleKey(c.result), dueDate: c.result.dueDate }));
  // After the due work: a valve check that falls due anyway is not raised a second time early.
  if (closingValveBikes?.size) work.push(...earlyValveWork(computed, closingValveBikes));
  const raised = await raiseTask(db, work, now);
  const unsafe = new Map<string, string[]>();
  for (const c of wanted) {
    if (c.result.status === 'overdue' && c.item.safetyCritical) unsafe.set(c.bikeId, [...(unsafe.get(c.bikeId) ?? []), c.item.name]);
  }
  // One statement grounds every bike still in service (most were grounded by an earlier run), one
  // more records why.
  const reasons = [...unsafe].map(([bikeId, names]) => ({ id: bikeId, reason: `Overdue safety-critical work: ${names.join(', ')}. Do not ride until it is done and signed off.` }));
  const grounded = reasons.length
    ? ((await db.execute(sql`
        update bikes b set status = 'out_of_service', status_reason = x.reason, updated_at = ${now.toISOString()}::timestamptz
          from jsonb_to_recordset(${JSON.stringify(reasons)}::jsonb) as x(id uuid, reason text)
         where b.id = x.id and b.status = 'in_service'
        returning b.id, x.reason`)) as unknown as { rows: { id: string; reason: string }[] }).rows
    : [];
  if (grounded.length) {
    await db.insert(auditLog).values(
      grounded.map(({ id: bikeId, reason }) => ({ userId: null, action: 'grounded', entity: 'bike', entityId: bikeId, changes: { status: ['in_service', 'out_of_service'], reason } })),
    );
  }
  return { computed: computed.length, tasksRaised: raised.due, earlyValveChecks: raised.early, bikesGrounded: grounded.length };
}

/** Work the scan would raise for one computed item, in one due cycle. */
interface WorkToRaise {
  due: ComputedDue;
  cycleKey: string;
  dueDate: string | null;
  origin?: 'trend';
  note?: string;
}

/**
 * Raises the work not already raised for its cycle (nor open already), each task given to the least
 * loaded technician of the bike's site, in one statement. The unique (bike, item,
 * cycle) key turns a task another run raised meanwhile into no row. Returns how many were raised.
 */
async function raiseTask(db: Writer, work: WorkToRaise[], now: Date): Promise<{ due: number; early: number }> {
  if (!work.length) return { due: 0, early: 0 };
  const existing = await existingTasks(db, [...new Set(work.map((w) => w.due.bikeId))]);
  // One open task per bike and item: the first piece of work for a pair wins.
  const taken = new Set<string>();
  const fresh = work.filter((w) => {
    const pair = doneKey(w.due.bikeId, w.due.item.id);
    if (taken.has(pair) || existing.has(w.due.bikeId, w.due.item.id, w.cycleKey)) return false;
    taken.add(pair);
    return true;
  });
  if (!fresh.length) return { due: 0, early: 0 };
  const loads = await technicianLoads(db, [...new Set(fresh.map((w) => w.due.siteId))]);
  const rows = fresh.map(({ due: c, ...w }) => ({
    bike_id: c.bikeId,
    service_item_id: c.item.id,
    cycle_key: w.cycleKey,
    origin: w.origin ?? 'due-scan',
    due_date: w.dueDate,
    estimated_minutes: c.item.estimatedMinutes,
    assignee_id: pickTechnician(loads.get(c.siteId), c.item.estimatedMinutes),
    note: w.note ?? null,
  }));
  // One statement with the rows as one JSON value: building thousands of bound parameters costs more than the insert.
  const { rows: counted } = (await db.execute(sql`
    with raised as (
      insert into service_tasks (bike_id, service_item_id, cycle_key, origin, due_date, estimated_minutes, assignee_id, note, raised_at)
      select bike_id, service_item_id, cycle_key, origin, due_date, estimated_minutes, assignee_id, note, ${now.toISOString()}::timestamptz
        from jsonb_to_recordset(${JSON.stringify(rows)}::jsonb)
             as x(bike_id uuid, service_item_id uuid, cycle_key text, origin text, due_date date, estimated_minutes integer, assignee_id uuid, note text)
      on conflict do nothing
      returning origin)
    select (count(*) filter (where origin <> 'trend'))::int as due, (count(*) filter (where origin = 'trend'))::int as early from raised`)) as unknown as {
    rows: { due: number; early: number }[];
  };
  return { due: Number(counted[0].due), early: Number(counted[0].early) };
}

/**
 * Which (bike, item) pairs already have a task for a given cycle or any task still open (an early
 * one, say): read once for the bikes concerned rather than once per item.
 */
async function existingTasks(db: Writer, bikeIds: string[]) {
  const open = new Set<string>();
  const cycles = new Set<string>();
  if (!bikeIds.length) return { has: () => false };
  const rows = await db
    .select({ bikeId: serviceTasks.bikeId, itemId: serviceTasks.serviceItemId, key: serviceTasks.cycleKey, status: serviceTasks.status })
    .from(serviceTasks)
    .where(sql`${serviceTasks.bikeId} = any(${uuidArray(bikeIds)})`);
  for (const r of rows) {
    cycles.add(`${r.bikeId}:${r.itemId}:${r.key}`);
    if (r.status === 'open' || r.status === 'in_progress') open.add(`${r.bikeId}:${r.itemId}`);
  }
  return { has: (bikeId: string, itemId: string, key: string) => open.has(`${bikeId}:${itemId}`) || cycles.has(`${bikeId}:${itemId}:${key}`) };
}

/**
 * A valve whose clearance trend reaches the spec minimum before its next check brings that check
 * forward: an early valve task, once per due cycle, due today.
 */
function earlyValveWork(computed: ComputedDue[], closingValveBikes: ReadonlySet<string>): WorkToRaise[] {
  return computed
    .filter((c) => c.item.category === 'valves' && closingValveBikes.has(c.bikeId))
    .map((c) => ({
      due: c,
      cycleKey: `trend:${cycleKey(c.result)}`,
      origin: 'trend' as const,
      dueDate: c.today,
      note: 'Raised early: a valve is closing up faster than the interval allows.',
    }));
}

/** Recomputes one bike (after a check-in or a closed task), inside the caller's transaction. */
export async function recomputeBike(db: Writer, bikeId: string, now: Date) {
  const computed = computeAll(await loadDueInputs(db, now, [bikeId]));
  const report = await applyDue(db, computed, now);
  return { computed, report };
}
