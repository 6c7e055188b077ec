// A hand-built week at Saltmarsh Moto Hire & Rider School for the planner's tests, and a checker of a
// plan's hard rules written by brute force (every pair, every instant that matters), apart from the
// planner's own search structures.
import { TZDate } from '@date-fns/tz';
import type { FixedVisit, ModelDemand, PlanBike, PlanInput, PlanResult, PlanTask, PlanTechnician } from '../../shared/domain/plan-types';

export const ZONE = 'Europe/London';
/** Wall-clock time at the sites: at('2026-12-08', 9, 30). */
export const at = (day: string, hour: number, minute = 0) => {
  const [y, m, d] = day.split('-').map(Number);
  return new TZDate(y, m - 1, d, hour, minute, 0, ZONE).getTime();
};
export const addDays = (day: string, n: number) => {
  const [y, m, d] = day.split('-').map(Number);
  return new Date(Date.UTC(y, m - 1, d + n)).toISOString().slice(0, 10);
};
/** Mon 7 Dec 2026 … Sun 13 Dec 2026. */
export const WEEK = Array.from({ length: 7 }, (_, i) => addDays('2026-12-07', i));
const weekday = (day: string) => new Date(`${day}T12:00:00Z`).getUTCDay();

export function shifts(days: string[], from = 8, to = 16.5) {
  return days.map((d) => ({ start: at(d, Math.floor(from), (from % 1) * 60), end: at(d, Math.floor(to), (to % 1) * 60) }));
}
export const weekdays = WEEK.filter((d) => weekday(d) >= 1 && weekday(d) <= 5);

export function bike(id: string, siteId: string, model: 'Strider 125' | 'Breeze 125' | 'Pathfinder 250' | 'Ridgeback 400', more: Partial<PlanBike> = {}): PlanBike {
  return { id, fleetNumber: id, siteId, modelId: model, modelName: model, available: true, bookings: [], ...more };
}

let taskCount = 0;
export function task(bikeId: string, itemName: string, dueDate: string, more: Partial<PlanTask> = {}): PlanTask {
  taskCount++;
  return {
    id: more.id ?? `t-${String(taskCount).padStart(3, '0')}`,
    bikeId,
    itemName,
    minutes: 60,
    dueDate,
    deadline: at(addDays(dueDate, 1), 0),
    safetyCritical: false,
    remainingKm: null,
    usageKmPerDay: null,
    ...more,
  };
}

/** Quay Street (Bay 1, Bay 2; Tomasz Reed Mon–Fri) and Airfield (Bay 1; Priya Vale Mon–Sat), open Mon–Sat 08:00–17:30. */
export function scene(parts: { bikes: PlanBike[]; tasks: PlanTask[]; demands?: ModelDemand[]; fixed?: FixedVisit[]; technicians?: PlanTechnician[] }): PlanInput {
  const open = WEEK.filter((d) => weekday(d) !== 0).map((d) => ({ start: at(d, 8), end: at(d, 17, 30) }));
  return {
    from: at(WEEK[0], 0),
    to: at(addDays(WEEK[6], 1), 0),
    sites: [
      { id: 'quay', name: 'Quay Street', timeZone: ZONE, open },
      { id: 'airfield', name: 'Airfield', timeZone: ZONE, open },
    ],
    bays: [
      { id: 'quay-1', siteId: 'quay', name: 'Bay 1' },
      { id: 'quay-2', siteId: 'quay', name: 'Bay 2' },
      { id: 'air-1', siteId: 'airfield', name: 'Bay 1' },
    ],
    technicians: parts.technicians ?? [
      { id: 'tomasz', name: 'Tomasz Reed', siteId: 'quay', shifts: shifts(weekdays) },
      { id: 'priya', name: 'Priya Vale', siteId: 'airfield', shifts: shifts(WEEK.slice(0, 6)) },
    ],
    bikes: parts.bikes,
    demands: parts.demands ?? [],
    tasks: parts.tasks,
    fixed: parts.fixed ?? [],
    windowDays: 14,
    windowKm: 600,
  };
}

const overlaps = (a: { start: number; end: number }, b: { start: number; end: number }) => a.start < b.end && b.start < a.end;

/** Every broken hard rule of a plan, in words; empty when the plan keeps them all. */
export function brokenRules(input: PlanInput, plan: PlanResult): string[] {
  const out: string[] = [];
  const tasks = new Map(input.tasks.map((t) => [t.id, t]));
  const bikes = new Map(input.bikes.map((b) => [b.id, b]));
  const all = [...plan.visits.map((v) => ({ ...v, id: v.key, fixed: false })), ...input.fixed.map((f) => ({ ...f, fixed: true }))];
  const seen = new Map<string, number>();
  for (const v of plan.visits) {
    const b = bikes.get(v.bikeId)!;
    if (v.siteId !== b.siteId) out.push(`${v.key} is not at its bike's site`);
    if (!input.bays.some((x) => x.id === v.bayId && x.siteId === v.siteId)) out.push(`${v.key} is on a bay of another site`);
    const tech = input.technicians.find((t) => t.id === v.technicianId && t.siteId === v.siteId);
    if (!tech) out.push(`${v.key} has a technician of another site`);
    else if (!tech.shifts.some((s) => s.start <= v.start && v.end <= s.end)) out.push(`${v.key} is outside one shift of its technician`);
    if (v.start % (15 * 60_000) !== 0) out.push(`${v.key} is off the quarter-hour grid`);
    if (v.start < input.from || v.end > input.to) out.push(`${v.key} is outside the horizon`);
    const minutes = v.taskIds.reduce((n, id) => n + (tasks.get(id)?.minutes ?? NaN), 0);
    if (v.end - v.start !== minutes * 60_000) out.push(`${v.key} does not last its tasks' minutes`);
    for (const id of v.taskIds) {
      seen.set(id, (seen.get(id) ?? 0) + 1);
      if (tasks.get(id)?.bikeId !== v.bikeId) out.push(`${v.key} holds another bike's task ${id}`);
      if (input.fixed.some((f) => f.taskIds.includes(id))) out.push(`${v.key} holds a fixed visit's task`);
    }
    for (const k of b.bookings) if (overlaps(v, k)) out.push(`${v.key} overlaps the bike's booking ${k.bookingId}`);
  }
  for (const t of input.tasks) {
    const n = seen.get(t.id) ?? 0;
    if (n > 1) out.push(`${t.id} is in ${n} visits`);
    if (n === 0 && !plan.unplaced.some((u) => u.taskId === t.id)) out.push(`${t.id} is neither placed nor listed as unplaced`);
  }
  for (let i = 0; i < all.length; i++) {
    for (let j = i + 1; j < all.length; j++) {
      const a = all[i];
      const b = all[j];
      if (a.fixed && b.fixed) continue;
      if (!overlaps(a, b)) continue;
      if (a.bayId === b.bayId) out.push(`${a.id} and ${b.id} share a bay`);
      if (a.technicianId === b.technicianId) out.push(`${a.id} and ${b.id} share a technician`);
      if (a.bikeId === b.bikeId) out.push(`${a.id} and ${b.id} hold the same bike`);
    }
  }
  // Model cover, at every instant where something changes: bikes of the model free ≥ the bookings' sum,
  // unless it already falls short without the plan's visits (then no planned visit may take one more).
  for (const d of input.demands) {
    const mine = input.bikes.filter((b) => b.available && b.siteId === d.siteId && b.modelId === d.modelId);
    const same = input.demands.filter((x) => x.siteId === d.siteId && x.modelId === d.modelId);
    const away = (b: PlanBike, t: number, withPlan: boolean) =>
      b.bookings.some((k) => k.start <= t && t < k.end) || all.some((v) => (withPlan || v.fixed) && v.bikeId === b.id && v.start <= t && t < v.end);
    const points = new Set<number>([d.start]);
    for (const x of [...same, ...mine.flatMap((b) => b.bookings), ...all.filter((v) => mine.some((b) => b.id === v.bikeId))]) {
      for (const t of [x.start, x.end]) if (t >= d.start && t < d.end) points.add(t);
    }
    for (const t of points) {
      const need = same.filter((x) => x.start <= t && t < x.end).reduce((n, x) => n + x.quantity, 0);
      const free = mine.filter((b) => !away(b, t, true)).length;
      const freeBefore = mine.filter((b) => !away(b, t, false)).length;
      if (free < need && free < freeBefore) out.push(`only ${free} ${d.modelId} free at ${new Date(t).toISOString()} for ${need} booked`);
    }
  }
  return [...new Set(out)];
}
