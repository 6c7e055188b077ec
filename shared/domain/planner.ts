// The workshop planner: places each bike's due work on a bay, with a technician, while the bike is
// idle and before it falls due. Pure and deterministic: the same input gives the same plan.
import type { PlanInput, PlanObjective, PlanResult, PlanTask, PlannedVisit, UnplacedTask } from './plan-types';
import { daysBetween } from './dates';
import { PlanState, coverKey, lateDays, unplacedDays, type Spot, type VisitGroup } from './planner-state';
import { compareObjective, planObjective } from './planner-objective';
import { explainLeftOut, explainVisit } from './planner-explain';

export { planObjective, scalarObjective, compareObjective } from './planner-objective';
export { checkPlacement } from './planner-check';
export type { VisitGroup } from './planner-state';

/**
 * A bike's items that fall due within the window of its earliest one come in one visit, so the bike
 * is off the road once; the items after that form the next visit the same way. With a usage of u km
 * a day, the window is the smaller of `windowDays` and `windowKm / u` days.
 */
export function groupIntoVisits(tasks: PlanTask[], windowDays: number, windowKm: number): VisitGroup[] {
  const byBike = new Map<string, PlanTask[]>();
  for (const t of [...tasks].sort((a, b) => cmp(a.bikeId, b.bikeId) || cmp(a.dueDate, b.dueDate) || cmp(a.id, b.id))) {
    byBike.set(t.bikeId, [...(byBike.get(t.bikeId) ?? []), t]);
  }
  const groups: VisitGroup[] = [];
  for (const [bikeId, list] of byBike) {
    const usage = list.find((t) => t.usageKmPerDay !== null && t.usageKmPerDay > 0)?.usageKmPerDay ?? null;
    const window = usage ? Math.min(windowDays, windowKm / usage) : windowDays;
    let rest = list;
    while (rest.length) {
      const first = rest[0];
      const members = rest.filter((t) => daysBetween(first.dueDate, t.dueDate) <= window);
      rest = rest.filter((t) => daysBetween(first.dueDate, t.dueDate) > window);
      groups.push(makeGroup(bikeId, members));
    }
  }
  return groups;
}

function makeGroup(bikeId: string, members: PlanTask[]): VisitGroup {
  const safety = members.filter((t) => t.safetyCritical);
  const binding = (safety.length ? safety : members).reduce((a, b) => (b.deadline < a.deadline ? b : a));
  return {
    key: `${bikeId}:${members[0].id}`,
    bikeId,
    taskIds: members.map((t) => t.id),
    tasks: members,
    minutes: members.reduce((n, t) => n + t.minutes, 0),
    latestDate: binding.dueDate,
    deadline: binding.deadline,
  };
}

const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/** A visit longer than any shift at its site is split, in due order, into visits that fit one. */
function fitShifts(input: PlanInput, groups: VisitGroup[]): VisitGroup[] {
  const siteOf = new Map(input.bikes.map((b) => [b.id, b.siteId]));
  const longest = new Map<string, number>();
  for (const t of input.technicians) {
    for (const s of t.shifts) longest.set(t.siteId, Math.max(longest.get(t.siteId) ?? 0, (s.end - s.start) / 60_000));
  }
  const out: VisitGroup[] = [];
  for (const g of groups) {
    const max = longest.get(siteOf.get(g.bikeId) ?? '') ?? 0;
    if (g.minutes <= max || g.tasks.length === 1) {
      out.push(g);
      continue;
    }
    let chunk: PlanTask[] = [];
    for (const t of g.tasks) {
      if (chunk.length && chunk.reduce((n, c) => n + c.minutes, 0) + t.minutes > max) {
        out.push(makeGroup(g.bikeId, chunk));
        chunk = [];
      }
      chunk.push(t);
    }
    out.push(makeGroup(g.bikeId, chunk));
  }
  return out;
}

/** Earliest due first; safety-critical work before other work due the same day; longer first; then by key. */
const dueOrder = (a: VisitGroup, b: VisitGroup) =>
  firstDeadline(a) - firstDeadline(b) || a.deadline - b.deadline || Number(hasSafety(b)) - Number(hasSafety(a)) || b.minutes - a.minutes || cmp(a.key, b.key);
const hasSafety = (g: VisitGroup) => g.tasks.some((t) => t.safetyCritical);
/** Every item counts its own lateness, so the order goes by a visit's first due item. */
const firstDeadline = (g: VisitGroup) => Math.min(...g.tasks.map((t) => t.deadline));

type Local = [number, number, number, number, number, number];

/** What one visit adds to the objective at a spot (or left out), with its site's spread after it, then its start. */
function local(state: PlanState, g: VisitGroup, spot: Spot | undefined): Local {
  let safety = 0;
  let late = 0;
  for (const t of g.tasks) {
    const d = spot ? lateDays(t, spot.end) : unplacedDays(t, state.input.to);
    if (t.safetyCritical) safety += d;
    else late += d;
  }
  const siteId = state.siteOf(g);
  if (!spot) return [safety, late, 0, 0, siteId ? state.spread(siteId) : 0, Infinity];
  return [safety, late, state.bookedLoss(g, spot.start, spot.end), 1, state.spread(spot.siteId, { technicianId: spot.technicianId, minutes: g.minutes }), spot.start];
}

function better(a: number[], b: number[]): boolean {
  for (let i = 0; i < a.length; i++) {
    if (Math.abs(a[i] - b[i]) > 1e-6 || (a[i] === Infinity) !== (b[i] === Infinity)) return a[i] < b[i];
  }
  return false;
}

function bestSpot(state: PlanState, g: VisitGroup): Spot | undefined {
  let best: Spot | undefined;
  let bestScore: Local | undefined;
  for (const spot of state.candidates(g)) {
    const score = local(state, g, spot);
    if (!bestScore || better(score, bestScore)) {
      best = spot;
      bestScore = score;
    }
  }
  return best;
}

interface Run {
  state: PlanState;
  groups: VisitGroup[];
}

function greedy(input: PlanInput, groups: VisitGroup[], choose: (s: PlanState, g: VisitGroup) => Spot | undefined): Run {
  const state = new PlanState(input);
  for (const g of groups) {
    const spot = choose(state, g);
    if (spot) state.place(g, spot);
  }
  return { state, groups };
}

const isLate = (run: Run, g: VisitGroup) => {
  const spot = run.state.placed.get(g.key);
  return !spot || g.tasks.some((t) => lateDays(t, spot.end) > 0);
};

/** Moves each visit to its best spot while that helps, and lets late work take the place of work that can wait. */
function improve(run: Run, rounds = 3): void {
  const { state } = run;
  const budget = { trades: TRADE_BUDGET };
  for (let round = 0; round < rounds; round++) {
    let changed = false;
    const seq = [...run.groups].sort((a, b) => Number(isLate(run, b)) - Number(isLate(run, a)) || dueOrder(a, b));
    for (const g of seq) {
      const old = state.unplace(g);
      const oldScore = local(state, g, old);
      const best = bestSpot(state, g);
      if (best && better(local(state, g, best), oldScore)) {
        state.place(g, best);
        changed = true;
      } else if (old) state.place(g, old);
    }
    for (const g of seq) {
      const spot = state.placed.get(g.key);
      if ((isLate(run, g) || (round === 0 && spot && state.bookedLoss(g, spot.start, spot.end) > 0)) && trade(run, g, budget)) changed = true;
    }
    if (!changed) break;
  }
}

const MAX_TRADES = 8;
/** Trades tried per improvement (a count, not a clock, so the plan stays deterministic). */
const TRADE_BUDGET = 600;

/** A late visit, or one that keeps a booked bike away, takes the spot of another (which then goes where it best can), when the plan gains. */
function trade(run: Run, g: VisitGroup, budget: { trades: number }): boolean {
  const { state } = run;
  if (budget.trades <= 0) return false;
  const siteId = state.siteOf(g);
  if (!siteId) return false;
  const bike = state.bikes.get(g.bikeId)!;
  const demandTimes = state.demandTimes.get(coverKey(bike.siteId, bike.modelId)) ?? [];
  // Visits of bikes of the same model that take the cover its bookings need first, then those with the most time to spare.
  const takesCover = (b: VisitGroup, spot: Spot) => {
    const other = state.bikes.get(b.bikeId)!;
    return other.available && other.modelId === bike.modelId && demandTimes.some((i) => i.start < Math.min(spot.end, g.deadline) && i.end > spot.start);
  };
  const others = run.groups
    .filter((b) => b !== g && state.siteOf(b) === siteId)
    .map((b) => ({ b, spot: state.placed.get(b.key) }))
    .filter((x): x is { b: VisitGroup; spot: Spot } => !!x.spot && x.spot.start < g.deadline)
    .map((x) => ({ ...x, cover: takesCover(x.b, x.spot) }))
    .sort((x, y) => Number(y.cover) - Number(x.cover) || firstDeadline(y.b) - y.spot.end - (firstDeadline(x.b) - x.spot.end) || cmp(x.b.key, y.b.key))
    .slice(0, MAX_TRADES);
  for (const { b } of others) {
    if (budget.trades-- <= 0) return false;
    const before = sum(local(state, g, state.placed.get(g.key)), local(state, b, state.placed.get(b.key)), state.spread(siteId));
    const oldG = state.unplace(g);
    const oldB = state.unplace(b)!;
    const newG = bestSpot(state, g);
    if (newG) state.place(g, newG);
    const newB = bestSpot(state, b);
    if (newB) state.place(b, newB);
    const after = sum(local(state, g, newG), local(state, b, newB), state.spread(siteId));
    if (better(after, before)) return true;
    state.unplace(g);
    state.unplace(b);
    if (oldG) state.place(g, oldG);
    state.place(b, oldB);
  }
  return false;
}

/** Lateness, booked hours and visits of two visits, then their site's spread. */
const sum = (a: Local, b: Local, spread: number) => [a[0] + b[0], a[1] + b[1], a[2] + b[2], a[3] + b[3], spread];

/** The visits the planner places, in the order it places them: grouped by window, split to fit a shift, earliest due first. */
export function prepareGroups(input: PlanInput): VisitGroup[] {
  return fitShifts(input, groupIntoVisits(input.tasks, input.windowDays, input.windowKm)).sort(dueOrder);
}

/**
 * The input with only the work a plan made now should place: a visit whose items all fall due after
 * the horizon waits for a later plan. Placed now, it would take the first free slot weeks early
 * (the bike losing that much of its service interval) and hold a bay that nearer work may need.
 * Work due inside the horizon still brings the later items of its window with it.
 */
export function dueWithinHorizon(input: PlanInput): PlanInput {
  const keep = new Set(
    groupIntoVisits(input.tasks, input.windowDays, input.windowKm)
      .filter((g) => g.tasks.some((t) => t.deadline <= input.to))
      .flatMap((g) => g.taskIds),
  );
  return { ...input, tasks: input.tasks.filter((t) => keep.has(t.id)) };
}

/**
 * The plan. Work that fits nowhere before its due date is still placed, as early as it can be, when
 * the horizon has room; it is then listed in `unplaced` too, with a reason that starts "Placed on …"
 * and a way out, so the desk sees it. Work with no room in the horizon at all is only in `unplaced`.
 */
export function planWorkshop(input: PlanInput): PlanResult {
  const groups = prepareGroups(input);
  const floor = greedy(input, groups, (s, g) => s.earliest(g));
  let best = greedy(input, groups, bestSpot);
  improve(best);
  if (compareObjective(objectiveOf(floor), objectiveOf(best)) < 0) {
    improve(floor);
    if (compareObjective(objectiveOf(floor), objectiveOf(best)) < 0) best = floor;
  }
  return result(reorder(input, best));
}

/** Whole re-runs the work allows: many for a small plan, few for a large one (a count, so the plan stays deterministic). */
const reruns = (groups: number) => Math.min(80, Math.floor(30_000 / Math.max(1, groups) ** 2));

/** A small seeded generator (mulberry32): the same input always sees the same sequence. */
function sequence(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Late work and work that keeps a booked bike away often need a stretch that earlier choices cut
 * up. Each re-run plans everything again in another order: first with one such visit put first,
 * then with a visit moved a few places earlier. A re-run is kept when its plan is no worse, so the
 * search can cross level ground; the best plan seen is returned.
 */
function reorder(input: PlanInput, start: Run): Run {
  let best = start;
  let bestObjective = objectiveOf(best);
  let current = best.groups;
  let currentObjective = bestObjective;
  const next01 = sequence(current.length * 7919 + input.tasks.length);
  const tried = new Set<string>();
  const wanting = (run: Run, g: VisitGroup) => {
    const spot = run.state.placed.get(g.key);
    return isLate(run, g) || (spot !== undefined && run.state.bookedLoss(g, spot.start, spot.end) > 0);
  };
  for (let i = 0; i < reruns(current.length); i++) {
    const first = current.find((g) => !tried.has(g.key) && wanting(best, g));
    let order: VisitGroup[];
    if (first) {
      tried.add(first.key);
      order = [first, ...current.filter((g) => g !== first)];
    } else {
      if (current.length < 2) break;
      const from = 1 + Math.floor(next01() * (current.length - 1));
      const to = Math.max(0, from - 1 - Math.floor(next01() * 4));
      order = [...current];
      const [moved] = order.splice(from, 1);
      order.splice(to, 0, moved);
    }
    const run = greedy(input, order, bestSpot);
    improve(run, 1);
    const o = objectiveOf(run);
    if (compareObjective(o, currentObjective) <= 0) {
      current = order;
      currentObjective = o;
      if (compareObjective(o, bestObjective) < 0) {
        best = run;
        bestObjective = o;
      }
    }
  }
  return best;
}

/** The earliest-due-date greedy alone (each visit at its earliest spot): the floor the planner improves on. */
export function greedyPlan(input: PlanInput): PlanResult {
  return result(greedy(input, prepareGroups(input), (s, g) => s.earliest(g)));
}

function objectiveOf(run: Run): PlanObjective {
  return planObjective(run.state.input, plannedVisits(run, false), []);
}

function plannedVisits(run: Run, withWords: boolean): PlannedVisit[] {
  const out: PlannedVisit[] = [];
  for (const g of run.groups) {
    const spot = run.state.placed.get(g.key);
    if (!spot) continue;
    out.push({
      key: g.key,
      bikeId: g.bikeId,
      siteId: spot.siteId,
      bayId: spot.bayId,
      technicianId: spot.technicianId,
      start: spot.start,
      end: spot.end,
      taskIds: g.taskIds,
      latestDate: g.latestDate,
      why: withWords ? explainVisit(run.state, g, spot) : [],
    });
  }
  return out.sort((a, b) => a.start - b.start || cmp(a.key, b.key));
}

function result(run: Run): PlanResult {
  const visits = plannedVisits(run, true);
  const unplaced: UnplacedTask[] = [];
  const behind = run.groups.filter((g) => isLate(run, g));
  for (const g of behind) {
    const spot = run.state.placed.get(g.key);
    const short = behind.filter((o) => run.state.siteOf(o) === run.state.siteOf(g) && firstDeadline(o) <= firstDeadline(g)).reduce((n, o) => n + o.minutes, 0);
    const words = explainLeftOut(run.state, g, spot, short);
    for (const t of g.tasks) {
      if (spot && lateDays(t, spot.end) === 0) continue;
      unplaced.push({ taskId: t.id, bikeId: g.bikeId, siteId: run.state.siteOf(g) ?? '', reason: words.reason, remedy: words.remedy });
    }
  }
  unplaced.sort((a, b) => cmp(a.siteId, b.siteId) || cmp(a.bikeId, b.bikeId) || cmp(a.taskId, b.taskId));
  return { visits, unplaced, objective: planObjective(run.state.input, visits, unplaced) };
}
