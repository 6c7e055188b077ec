// A day-level model of the same plan for the HiGHS solver (server and tests only: the client never
// imports it). Each visit goes on a day with a technician, or stays out; capacities are minutes per
// technician-day and per site-day. Every timed plan maps onto it with an objective no larger than its
// own (see `coefficients`), so its optimum is a lower bound on the best timed plan.
import type { PlanInput } from './plan-types';
import { PlanState, coverKey, lateDays, unplacedDays, type VisitGroup } from './planner-state';
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
  /** Placed clear of the bookings of this model at its site (no booked hours lost). */
  clearOf?: string;
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
    const fixedOf = union(input.fixed.filter((f) => f.technicianId === t.id));
    for (const s of t.shifts) {
      const usable = clip(s, input);
      if (usable.end <= usable.start) continue;
      const day = isoDayOf(s.start, zone);
      caps.set(day, (caps.get(day) ?? 0) + outside(usable, fixedOf).reduce((n, p) => n + gridMinutes(p), 0));
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
      const bike = state.bikes.get(g.bikeId)!;
      const key = coverKey(bike.siteId, bike.modelId);
      const demand = bike.available ? (state.demandTimes.get(key) ?? []) : [];
      // Per day: the earliest end of a spot that keeps clear of the model's bookings, and of one that does not with its fewest booked hours.
      const byDay = new Map<string, { freeEnd: number; lossEnd: number; loss: number }>();
      for (const shift of t.shifts) {
        let spot = state.searchShift(g, t, shift, shift.start);
        if (!spot) continue;
        const day = isoDayOf(shift.start, zone);
        const best = byDay.get(day) ?? { freeEnd: Infinity, lossEnd: Infinity, loss: Infinity };
        const touches = demand.some((i) => i.start < shift.end && i.end > shift.start);
        if (!touches) best.freeEnd = Math.min(best.freeEnd, spot.end);
        while (touches && spot) {
          const loss = state.bookedLoss(g, spot.start, spot.end);
          if (loss > 0) {
            best.lossEnd = Math.min(best.lossEnd, spot.end);
            best.loss = Math.min(best.loss, loss);
          } else best.freeEnd = Math.min(best.freeEnd, spot.end);
          spot = state.searchShift(g, t, shift, spot.start + QUARTER);
        }
        byDay.set(day, best);
      }
      for (const [day, best] of byDay) {
        for (const free of [true, false]) {
          const end = free ? best.freeEnd : best.lossEnd;
          if (end === Infinity) continue;
          let safetyLate = 0;
          let late = 0;
          for (const task of g.tasks) {
            if (task.safetyCritical) safetyLate += lateDays(task, end);
            else late += lateDays(task, end);
          }
          const cost = safetyLate * W.safetyLateDay + late * W.lateDay + (free ? 0 : best.loss) * W.bookedHour + W.visit;
          columns.push({ name: `x${gi}_${columns.length}`, group: gi, day, tech: ti, minutes: g.minutes, cost, safetyLate, clearOf: free && demand.length ? key : undefined });
        }
      }
    });
  });
  return { columns, techs };
}

const clip = (i: { start: number; end: number }, input: PlanInput) => ({ start: Math.max(i.start, input.from), end: Math.min(i.end, input.to) });
/** Parts of `i` outside a merged, sorted list. */
function outside(i: { start: number; end: number }, merged: { start: number; end: number }[]): { start: number; end: number }[] {
  const out: { start: number; end: number }[] = [];
  let at = i.start;
  for (const m of merged) {
    if (m.end <= at || m.start >= i.end) continue;
    if (m.start > at) out.push({ start: at, end: m.start });
    at = Math.max(at, m.end);
  }
  if (at < i.end) out.push({ start: at, end: i.end });
  return out;
}
/** Quarter-rounded minutes back-to-back visits can take in a stretch (the last may end off the grid: + 14). */
const gridMinutes = (p: { start: number; end: number }) => Math.max(0, floorQ((p.end - Math.ceil(p.start / QUARTER) * QUARTER) / 60_000 + 14));

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
  // A site's bay minutes on a day: each bay over the time someone works there that day, outside its fixed visits.
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
    const siteBays = input.bays.filter((b) => b.siteId === site.id).map((b) => union(input.fixed.filter((f) => f.bayId === b.id)));
    for (const [day, shifts] of shiftsByDay) {
      const pieces = union(shifts);
      const cap = siteBays.reduce((n, fixedOnBay) => n + pieces.flatMap((p) => outside(p, fixedOnBay)).reduce((m, p) => m + gridMinutes(p), 0), 0);
      const list = columns.filter((c) => c.day === day && input.technicians[c.tech].siteId === site.id);
      if (list.length) rows.push(` s${r++}:\n${terms(list.map((c) => [ceilQ(c.minutes), c.name]))}\n  <= ${num(cap)}`);
    }
  }
  // Visits kept clear of a model's bookings fit in the time outside them, per technician-day and per site-day.
  const clear = new Map<string, Column[]>();
  for (const c of columns) {
    if (!c.clearOf) continue;
    for (const k of [`t#${c.tech}#${c.day}#${c.clearOf}`, `s#${input.technicians[c.tech].siteId}#${c.day}#${c.clearOf}`]) clear.set(k, [...(clear.get(k) ?? []), c]);
  }
  for (const [k, list] of clear) {
    const [kind, who, day, model] = k.split('#');
    const booked = state.demandTimes.get(model) ?? [];
    let cap: number;
    if (kind === 't') {
      const t = input.technicians[Number(who)];
      const zone = state.sites.get(t.siteId)!.timeZone;
      const blocked = union([...booked, ...input.fixed.filter((f) => f.technicianId === t.id)]);
      cap = t.shifts.filter((x) => isoDayOf(x.start, zone) === day).flatMap((x) => outside(clip(x, input), blocked)).reduce((n, p) => n + gridMinutes(p), 0);
    } else {
      const site = state.sites.get(who)!;
      const worked = union(input.technicians.filter((t) => t.siteId === who).flatMap((t) => t.shifts.filter((x) => isoDayOf(x.start, site.timeZone) === day).map((x) => clip(x, input))));
      const pieces = worked.flatMap((w) => outside(w, booked));
      cap = input.bays
        .filter((b) => b.siteId === who)
        .reduce((n, b) => n + pieces.flatMap((p) => outside(p, union(input.fixed.filter((f) => f.bayId === b.id)))).reduce((m, p) => m + gridMinutes(p), 0), 0);
    }
    rows.push(` c${r++}:\n${terms(list.map((c) => [ceilQ(c.minutes), c.name]))}\n  <= ${num(Math.max(0, cap))}`);
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

/** HiGHS stops once its plan is proved within this share of the optimum. */
const MIP_GAP = 1e-4;

export interface MipBound {
  /** A lower bound on the scalar objective of any timed plan: the day-level optimum when proved, else the LP relaxation's. */
  objective: number;
  status: string;
  /** The LP relaxation's optimum (the bound without whole-number choices). */
  lpBound?: number;
  /** The scalar objective of the day-level plan the solver found (when it found one). */
  found?: number;
  /** Safety-critical days late in the solver's day-level plan (when it found one). */
  safetyLateDays?: number;
}

/** The solver's bound for a plan's input. `relax` solves only the LP relaxation. */
export async function mipBound(input: PlanInput, opts: { relax?: boolean; timeLimit?: number } = {}): Promise<MipBound> {
  const highs = await loadSolver();
  const options = { time_limit: opts.timeLimit ?? 30, mip_rel_gap: MIP_GAP, output_flag: false };
  const lpModel = buildDayModel(input, true);
  const lp = highs.solve(lpModel.lp, options);
  const lpBound = lp.Status === 'Optimal' ? lp.ObjectiveValue : undefined;
  if (opts.relax) return { objective: lpBound ?? 0, status: lp.Status, lpBound };
  const model = buildDayModel(input, false);
  const mip = highs.solve(model.lp, options);
  if (mip.Status !== 'Optimal') return { objective: lpBound ?? 0, status: mip.Status, lpBound };
  const safetyLateDays = model.columns.reduce((n, c) => n + ((mip.Columns[c.name]?.Primal ?? 0) > 0.5 ? c.safetyLate : 0), 0) +
    model.groups.reduce((n, g, gi) => n + ((mip.Columns[`u${gi}`]?.Primal ?? 0) > 0.5 ? g.tasks.filter((t) => t.safetyCritical).reduce((m, t) => m + unplacedDays(t, input.to), 0) : 0), 0);
  // Stopped within the relative gap: the best bound is at least this far below the plan it found.
  return { objective: mip.ObjectiveValue * (1 - MIP_GAP), status: mip.Status, lpBound, found: mip.ObjectiveValue, safetyLateDays };
}
