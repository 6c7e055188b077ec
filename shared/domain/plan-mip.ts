// A day-level model of the same plan for the HiGHS solver (server and tests only: the client never
// imports it). Each visit goes on a day with a technician, or stays out; capacities are minutes per
// technician-day and per site-day. Every timed plan maps onto it with an objective no larger than its
// own (see `coefficients`), so its optimum is a lower bound on the best timed plan.
import type { PlanInput } from './plan-types';
import { PlanState, lateDays, unplacedDays, type VisitGroup } from './planner-state';
import { prepareGroups } from './planner';
import { SCALAR_WEIGHTS } from './planner-objective';
import { QUARTER, union } from './planner-timeline';
import { isoDayOf } from './planner-words';

export { scalarObjective, SCALAR_WEIGHTS } from './planner-objective';

type Highs = { solve(lp: string, options?: Record<string, unknown>): { Status: string; ObjectiveValue: number; Columns: Record<string, { Primal?: number }> } };
let solver: Promise<Highs> | undefined;
/** HiGHS, loaded once per process. */
function loadSolver(): Promise<Highs> {
  solver ??= import('highs').then(async (m) => (await m.default()) as unknown as Highs);
  return solver;
}

interface Column {
  name: string;
  group: number;
  day: string;
  tech: number;
  minutes: number;
  cost: number;
  safetyLate: number;
}

export interface DayModel {
  lp: string;
  columns: Column[];
  groups: VisitGroup[];
}

const W = SCALAR_WEIGHTS;
/** A quarter-hour start grid: back-to-back visits take their length rounded up to the quarter hour, except the last one. */
const ceilQ = (minutes: number) => Math.ceil(minutes / 15) * 15;
const floorQ = (minutes: number) => Math.floor(minutes / 15) * 15;

/**
 * Per visit, day and technician, the lowest cost any timed spot there could have: lateness at the
 * earliest feasible end (later spots end later), the fewest booked hours over all feasible starts,
 * and the visit itself. A (visit, day, technician) with no feasible start — the bike's bookings or
 * visits leave no gap, the technician is busy with fixed work, no bay is free of fixed work, or the
 * cover a model booking needs forbids it — gets no column.
 */
function coefficients(state: PlanState, groups: VisitGroup[]): { columns: Column[]; techs: { id: string; siteId: string; fixed: number; caps: Map<string, number> }[] } {
  const input = state.input;
  const techs = input.technicians.map((t) => {
    const zone = state.sites.get(t.siteId)?.timeZone ?? 'UTC';
    const caps = new Map<string, number>();
    for (const s of t.shifts) {
      const fixedIn = input.fixed.filter((f) => f.technicianId === t.id && f.start < s.end && f.end > s.start);
      const busy = fixedIn.reduce((n, f) => n + (Math.min(s.end, f.end) - Math.max(s.start, f.start)) / 60_000, 0);
      const usable = (Math.min(s.end, input.to) - Math.ceil(Math.max(s.start, input.from) / QUARTER) * QUARTER) / 60_000;
      if (usable <= 0) continue;
      const day = isoDayOf(s.start, zone);
      caps.set(day, (caps.get(day) ?? 0) + Math.max(0, floorQ(usable - busy + 14 * (fixedIn.length + 1))));
    }
    const fixed = input.fixed.filter((f) => f.technicianId === t.id && f.siteId === t.siteId).reduce((n, f) => n + (f.end - f.start) / 60_000, 0);
    return { id: t.id, siteId: t.siteId, fixed, caps };
  });
  const columns: Column[] = [];
  groups.forEach((g, gi) => {
    const siteId = state.siteOf(g);
    if (!siteId) return;
    input.technicians.forEach((t, ti) => {
      if (t.siteId !== siteId) return;
      const zone = state.sites.get(siteId)!.timeZone;
      const byDay = new Map<string, { end: number; loss: number }>();
      for (const shift of t.shifts) {
        let spot = state.searchShift(g, t, shift, shift.start);
        if (!spot) continue;
        const day = isoDayOf(shift.start, zone);
        const best = byDay.get(day) ?? { end: Infinity, loss: Infinity };
        best.end = Math.min(best.end, spot.end);
        while (spot && best.loss > 0) {
          best.loss = Math.min(best.loss, state.bookedLoss(g, spot.start, spot.end));
          spot = state.searchShift(g, t, shift, spot.start + QUARTER);
        }
        byDay.set(day, best);
      }
      for (const [day, best] of byDay) {
        let safetyLate = 0;
        let late = 0;
        for (const task of g.tasks) {
          if (task.safetyCritical) safetyLate += lateDays(task, best.end);
          else late += lateDays(task, best.end);
        }
        const cost = safetyLate * W.safetyLateDay + late * W.lateDay + best.loss * W.bookedHour + W.visit;
        columns.push({ name: `x${gi}_${columns.length}`, group: gi, day, tech: ti, minutes: g.minutes, cost, safetyLate });
      }
    });
  });
  return { columns, techs };
}

const num = (n: number) => (Number.isInteger(n) ? String(n) : n.toPrecision(12));

/** Writes terms over several lines (LP text readers cap line length). */
function terms(list: [number, string][]): string {
  const parts = list.map(([c, v], i) => `${c < 0 ? '-' : i === 0 ? '' : '+'} ${num(Math.abs(c))} ${v}`);
  const lines: string[] = [];
  for (let i = 0; i < parts.length; i += 8) lines.push(`  ${parts.slice(i, i + 8).join(' ')}`);
  return lines.join('\n') || '  0 u_none';
}

/** The day-level model of a plan's input, in CPLEX LP text. */
export function buildDayModel(input: PlanInput, relax = false): DayModel {
  const state = new PlanState(input);
  const groups = prepareGroups(input);
  const { columns, techs } = coefficients(state, groups);
  const obj: [number, string][] = [];
  const rows: string[] = [];
  for (const c of columns) obj.push([c.cost, c.name]);
  groups.forEach((g, gi) => {
    const penalty = g.tasks.reduce((n, t) => n + unplacedDays(t, input.to) * (t.safetyCritical ? W.safetyLateDay : W.lateDay), 0);
    obj.push([penalty, `u${gi}`]);
    const mine = columns.filter((c) => c.group === gi).map((c): [number, string] => [1, c.name]);
    rows.push(` a${gi}:\n${terms([...mine, [1, `u${gi}`]])}\n  = 1`);
  });
  // A technician's minutes on a day, within the shifts that start that day.
  const byTechDay = new Map<string, Column[]>();
  for (const c of columns) byTechDay.set(`${c.tech}|${c.day}`, [...(byTechDay.get(`${c.tech}|${c.day}`) ?? []), c]);
  let r = 0;
  for (const [k, list] of byTechDay) {
    const [ti, day] = k.split('|');
    const cap = techs[Number(ti)].caps.get(day) ?? 0;
    rows.push(` t${r++}:\n${terms(list.map((c) => [ceilQ(c.minutes), c.name]))}\n  <= ${num(cap)}`);
  }
  // A site's bay minutes on a day: its bays over the time someone works there that day, less fixed work.
  for (const site of input.sites) {
    const bays = input.bays.filter((b) => b.siteId === site.id).length;
    const shiftsByDay = new Map<string, { start: number; end: number }[]>();
    for (const t of input.technicians.filter((x) => x.siteId === site.id)) {
      for (const s of t.shifts) {
        const a = Math.max(s.start, input.from);
        const b = Math.min(s.end, input.to);
        if (b > a) shiftsByDay.set(isoDayOf(s.start, site.timeZone), [...(shiftsByDay.get(isoDayOf(s.start, site.timeZone)) ?? []), { start: a, end: b }]);
      }
    }
    for (const [day, shifts] of shiftsByDay) {
      const pieces = union(shifts);
      const fixedIn = input.fixed.filter((f) => f.siteId === site.id && pieces.some((p) => f.start < p.end && f.end > p.start));
      const fixedMinutes = fixedIn.reduce((n, f) => n + pieces.reduce((m, p) => m + Math.max(0, Math.min(p.end, f.end) - Math.max(p.start, f.start)), 0) / 60_000, 0);
      const cap = bays * pieces.reduce((n, p) => n + floorQ((p.end - p.start) / 60_000 + 14), 0) + 14 * fixedIn.length - fixedMinutes;
      const list = columns.filter((c) => c.day === day && input.technicians[c.tech].siteId === site.id);
      if (list.length) rows.push(` s${r++}:\n${terms(list.map((c) => [ceilQ(c.minutes), c.name]))}\n  <= ${num(Math.max(0, cap))}`);
    }
  }
  // Load spread: each site's largest and smallest technician minutes.
  const bounds: string[] = groups.map((_, gi) => ` 0 <= u${gi} <= 1`);
  for (const [si, site] of input.sites.entries()) {
    const mine = techs.map((t, ti) => ({ t, ti })).filter(({ t, ti }) => t.siteId === site.id && input.technicians[ti].shifts.length);
    if (!mine.length) continue;
    obj.push([W.spreadMinute, `hi${si}`], [-W.spreadMinute, `lo${si}`]);
    for (const { t, ti } of mine) {
      const load = columns.filter((c) => c.tech === ti).map((c): [number, string] => [-c.minutes, c.name]);
      rows.push(` h${r++}:\n${terms([[1, `hi${si}`], ...load])}\n  >= ${num(t.fixed)}`);
      rows.push(` l${r++}:\n${terms([[1, `lo${si}`], ...load])}\n  <= ${num(t.fixed)}`);
    }
    bounds.push(` 0 <= hi${si} <= 1e9`, ` 0 <= lo${si} <= 1e9`);
  }
  if (relax) for (const c of columns) bounds.push(` 0 <= ${c.name} <= 1`);
  const lp = [
    'Minimize',
    ` obj:\n${terms(obj)}`,
    'Subject To',
    ...rows,
    'Bounds',
    ...bounds,
    ...(relax || !columns.length ? [] : ['Binary', ...chunk(columns.map((c) => c.name))]),
    'End',
  ].join('\n');
  return { lp, columns, groups };
}

const chunk = (names: string[]) => Array.from({ length: Math.ceil(names.length / 10) }, (_, i) => ` ${names.slice(i * 10, i * 10 + 10).join(' ')}`);

export interface MipBound {
  /** A lower bound on the scalar objective of any timed plan: the day-level optimum when proved, else the LP relaxation's. */
  objective: number;
  status: string;
  /** The LP relaxation's optimum (the bound without whole-number choices). */
  lpBound?: number;
  /** Safety-critical days late in the solver's day-level plan (when it found one). */
  safetyLateDays?: number;
}

/** The solver's bound for a plan's input. `relax` solves only the LP relaxation. */
export async function mipBound(input: PlanInput, opts: { relax?: boolean; timeLimit?: number } = {}): Promise<MipBound> {
  const highs = await loadSolver();
  const options = { time_limit: opts.timeLimit ?? 30, mip_rel_gap: 1e-9, output_flag: false };
  const lpModel = buildDayModel(input, true);
  const lp = highs.solve(lpModel.lp, options);
  const lpBound = lp.Status === 'Optimal' ? lp.ObjectiveValue : undefined;
  if (opts.relax) return { objective: lpBound ?? 0, status: lp.Status, lpBound };
  const model = buildDayModel(input, false);
  const mip = highs.solve(model.lp, options);
  if (mip.Status !== 'Optimal') return { objective: lpBound ?? 0, status: mip.Status, lpBound };
  const safetyLateDays = model.columns.reduce((n, c) => n + ((mip.Columns[c.name]?.Primal ?? 0) > 0.5 ? c.safetyLate : 0), 0) +
    model.groups.reduce((n, g, gi) => n + ((mip.Columns[`u${gi}`]?.Primal ?? 0) > 0.5 ? g.tasks.filter((t) => t.safetyCritical).reduce((m, t) => m + unplacedDays(t, input.to), 0) : 0), 0);
  return { objective: mip.ObjectiveValue, status: mip.Status, lpBound, safetyLateDays };
}
