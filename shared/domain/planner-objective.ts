// The plan's objective, worked out the same way for the planner, its tests and the solver's check.
import type { PlanInput, PlanObjective, PlannedVisit, UnplacedTask } from './plan-types';
import { HOUR, overlapMs, union } from './planner-timeline';
import { lateDays, unplacedDays } from './planner-state';

/**
 * The objective of a plan. A task in a visit counts by how late that visit ends; a task in no visit
 * (listed in `unplaced`, or missing from both) counts as late to the horizon's end plus one day. A
 * task placed late is listed in `unplaced` too, to say why, but counts once, by its visit.
 * Booked hours count for in-service bikes only (a grounded bike is not hired out anyway), and the
 * load spread takes each site's technicians who work at least one shift in the horizon, with the
 * minutes of fixed visits.
 */
export function planObjective(input: PlanInput, visits: PlannedVisit[], unplaced: UnplacedTask[]): PlanObjective {
  const tasks = new Map(input.tasks.map((t) => [t.id, t]));
  const o: PlanObjective = { safetyLateDays: 0, lateDays: 0, bookedHoursLost: 0, visits: visits.length, loadSpread: 0 };
  const placed = new Set<string>();
  for (const v of visits) {
    for (const id of v.taskIds) {
      const t = tasks.get(id);
      if (!t) continue;
      placed.add(id);
      if (t.safetyCritical) o.safetyLateDays += lateDays(t, v.end);
      else o.lateDays += lateDays(t, v.end);
    }
  }
  const left = new Set([...unplaced.map((u) => u.taskId), ...input.tasks.map((t) => t.id)].filter((id) => !placed.has(id) && tasks.has(id)));
  for (const id of left) {
    const t = tasks.get(id)!;
    if (t.safetyCritical) o.safetyLateDays += unplacedDays(t, input.to);
    else o.lateDays += unplacedDays(t, input.to);
  }

  const bikes = new Map(input.bikes.map((b) => [b.id, b]));
  const demandTimes = new Map<string, ReturnType<typeof union>>();
  for (const v of visits) {
    const bike = bikes.get(v.bikeId);
    if (!bike?.available) continue;
    const k = `${bike.siteId}|${bike.modelId}`;
    if (!demandTimes.has(k)) demandTimes.set(k, union(input.demands.filter((d) => d.siteId === bike.siteId && d.modelId === bike.modelId)));
    o.bookedHoursLost += overlapMs(v.start, v.end, demandTimes.get(k)!) / HOUR;
  }

  const load = new Map<string, number>();
  for (const t of input.technicians) if (t.shifts.length) load.set(`${t.siteId}|${t.id}`, 0);
  const add = (siteId: string, technicianId: string, minutes: number) => {
    const k = `${siteId}|${technicianId}`;
    if (load.has(k)) load.set(k, load.get(k)! + minutes);
  };
  for (const f of input.fixed) add(f.siteId, f.technicianId, (f.end - f.start) / 60_000);
  for (const v of visits) add(v.siteId, v.technicianId, (v.end - v.start) / 60_000);
  for (const s of input.sites) {
    const mine = input.technicians.filter((t) => t.siteId === s.id && t.shifts.length).map((t) => load.get(`${s.id}|${t.id}`)!);
    if (mine.length) o.loadSpread += Math.max(...mine) - Math.min(...mine);
  }
  return o;
}

const TERMS = ['safetyLateDays', 'lateDays', 'bookedHoursLost', 'visits', 'loadSpread'] as const;

/** Negative when `a` is the better plan: compares the terms in order (booked hours to a millionth). */
export function compareObjective(a: PlanObjective, b: PlanObjective): number {
  for (const k of TERMS) {
    const d = a[k] - b[k];
    if (Math.abs(d) > 1e-6) return d;
  }
  return 0;
}

/**
 * One number for a plan, for the solver and the comparisons: a safety-critical day late weighs
 * 1,000,000, another item's day late 10,000, a booked hour lost 100, a visit 10 and an hour of load
 * spread 0.1. The order holds as long as a term's realistic range stays under the next weight up
 * (under 100 booked hours per late day, under 10 visits' worth of booked hours, and so on), which
 * is the case for a workshop plan of a few weeks.
 */
export const SCALAR_WEIGHTS = { safetyLateDay: 1_000_000, lateDay: 10_000, bookedHour: 100, visit: 10, spreadMinute: 0.1 / 60 } as const;

export function scalarObjective(o: PlanObjective): number {
  const w = SCALAR_WEIGHTS;
  return o.safetyLateDays * w.safetyLateDay + o.lateDays * w.lateDay + o.bookedHoursLost * w.bookedHour + o.visits * w.visit + o.loadSpread * w.spreadMinute;
}
