// The pure planner's figures on a generated fleet: a full plan, a re-plan of one bike around every
// other visit, the earliest-due-date floor, and the solver's LP bound. Run: npx tsx bench/plan-pure.ts
import { TZDate } from '@date-fns/tz';
import type { FixedVisit, ModelDemand, PlanBike, PlanInput, PlanObjective, PlanTask, PlanTechnician } from '../shared/domain/plan-types';
import { greedyPlan, planWorkshop } from '../shared/domain/planner';
import { mipBound, scalarObjective } from '../shared/domain/plan-mip';

export interface FleetOptions {
  seed: number;
  sites: number;
  baysPerSite: number;
  techsPerSite: number;
  days: number;
  bikes: number;
  tasks: number;
  /** Hires and lessons, of which this share books one bike and the rest a number of bikes of a model. */
  bookings: number;
  perBikeShare?: number;
  /** Visits already fixed on the first day. */
  fixed?: number;
  /** Tasks fall due from the second day to this many days after the first (default: two days past the horizon). */
  dueWithinDays?: number;
  /** Task lengths to pick from, in minutes. */
  minutes?: number[];
  /** First day of the horizon (a Monday), at the sites' wall clock. */
  firstDay?: string;
}

const ZONE = 'Europe/London';
const SITE_NAMES = ['Quay Street', 'Airfield', 'Harbour Yard'];
const MODELS = [
  { id: 'm-strider', name: 'Strider 125' },
  { id: 'm-pathfinder', name: 'Pathfinder 250' },
  { id: 'm-ridgeback', name: 'Ridgeback 400' },
  { id: 'm-breeze', name: 'Breeze 125' },
];
const ITEMS = [
  { name: 'Brake pads inspection', safety: true },
  { name: 'Tyres inspection', safety: true },
  { name: 'Chain adjust', safety: false },
  { name: 'Oil change', safety: false },
  { name: 'Air filter', safety: false },
  { name: 'Valve clearance check', safety: false },
];

/** A small seeded generator (mulberry32), so a fleet is the same for the same seed. */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const at = (day: string, hour: number, minute = 0) => {
  const [y, m, d] = day.split('-').map(Number);
  return new TZDate(y, m - 1, d, hour, minute, 0, ZONE).getTime();
};
const addDays = (day: string, n: number) => {
  const [y, m, d] = day.split('-').map(Number);
  return new Date(Date.UTC(y, m - 1, d + n)).toISOString().slice(0, 10);
};
const weekday = (day: string) => new Date(`${day}T12:00:00Z`).getUTCDay();

/**
 * A synthetic fleet: sites open Mon–Sat 08:00–17:30; technicians work Mon–Fri 08:00–16:30, every
 * other one also Saturday, and one in four takes a day off; bikes of four models; hires of one to
 * three days and lessons of two to three hours, most for one bike, the rest for 1–3 bikes of a model;
 * due work of 30 minutes to 3 hours, falling due over the horizon and a few days beyond.
 */
export function generatePlanInput(o: FleetOptions): PlanInput {
  const rnd = seededRandom(o.seed);
  const pick = <T>(list: readonly T[]) => list[Math.floor(rnd() * list.length)];
  const int = (lo: number, hi: number) => lo + Math.floor(rnd() * (hi - lo + 1));
  const first = o.firstDay ?? '2026-12-07';
  const days = Array.from({ length: o.days }, (_, i) => addDays(first, i));
  const from = at(first, 0);
  const to = at(addDays(first, o.days), 0);
  const sites = SITE_NAMES.slice(0, o.sites).map((name, i) => ({
    id: `site-${i + 1}`,
    name,
    timeZone: ZONE,
    open: days.filter((d) => weekday(d) !== 0).map((d) => ({ start: at(d, 8), end: at(d, 17, 30) })),
  }));
  const bays = sites.flatMap((s) => Array.from({ length: o.baysPerSite }, (_, i) => ({ id: `${s.id}-bay-${i + 1}`, siteId: s.id, name: `Bay ${i + 1}` })));
  const technicians: PlanTechnician[] = sites.flatMap((s, si) =>
    Array.from({ length: o.techsPerSite }, (_, i) => {
      const dayOff = i % 4 === 3 ? pick(days) : undefined;
      const shifts = days
        .filter((d) => d !== dayOff && (weekday(d) >= 1 && weekday(d) <= 5 ? true : weekday(d) === 6 && i % 2 === 1))
        .map((d) => ({ start: at(d, 8), end: at(d, 16, 30) }));
      return { id: `tech-${si + 1}-${i + 1}`, name: `Technician ${si + 1}.${i + 1}`, siteId: s.id, shifts };
    }),
  );
  const bikes: PlanBike[] = Array.from({ length: o.bikes }, (_, i) => {
    const site = sites[i % sites.length];
    const model = MODELS[Math.floor(i / sites.length) % MODELS.length];
    return { id: `bike-${String(i + 1).padStart(4, '0')}`, fleetNumber: `${site.name === 'Airfield' ? 'AF' : 'SM'}-${String(i + 1).padStart(2, '0')}`, siteId: site.id, modelId: model.id, modelName: model.name, available: rnd() > 0.05, bookings: [] };
  });
  const demands: ModelDemand[] = [];
  const share = o.perBikeShare ?? 0.8;
  for (let i = 0; i < o.bookings; i++) {
    const day = pick(days);
    const lesson = rnd() < 0.5;
    const start = lesson ? at(day, pick([9, 10, 13, 14]), pick([0, 0, 30])) : at(day, 9);
    const end = lesson ? start + int(2, 3) * 3_600_000 : at(addDays(day, int(0, 2)), 17);
    const kind = lesson ? ('lesson' as const) : ('hire' as const);
    const title = lesson ? pick(['Beginners', 'Road skills', 'Refresher']) : pick(['Family weekend', 'Coast tour', 'Day hire']);
    if (rnd() < share) {
      const bike = pick(bikes);
      bike.bookings.push({ bookingId: `booking-${i + 1}`, kind, title, start, end });
    } else {
      const site = pick(sites);
      const model = pick(MODELS);
      demands.push({ bookingId: `booking-${i + 1}`, siteId: site.id, modelId: model.id, quantity: int(1, 3), kind, title, start, end });
    }
  }
  const tasks: PlanTask[] = Array.from({ length: o.tasks }, (_, i) => {
    const bike = pick(bikes);
    const item = pick(ITEMS);
    const dueDate = addDays(first, int(1, o.dueWithinDays ?? o.days + 2));
    const usage = rnd() < 0.7 ? int(20, 120) : null;
    return {
      id: `task-${String(i + 1).padStart(5, '0')}`,
      bikeId: bike.id,
      itemName: item.name,
      minutes: pick(o.minutes ?? [30, 45, 60, 60, 90, 120, 40, 180]),
      dueDate,
      deadline: at(addDays(dueDate, 1), 0),
      safetyCritical: item.safety,
      remainingKm: usage ? int(0, 900) : null,
      usageKmPerDay: usage,
    };
  });
  const fixed: FixedVisit[] = [];
  for (let i = 0; i < (o.fixed ?? 0); i++) {
    const site = sites[i % sites.length];
    const tech = technicians.filter((t) => t.siteId === site.id)[Math.floor(i / sites.length) % o.techsPerSite];
    const shift = tech.shifts[0];
    const bike = bikes.filter((b) => b.siteId === site.id && !b.bookings.some((k) => k.start < shift.end && k.end > shift.start))[i];
    if (!shift || !bike) continue;
    const bay = bays.filter((b) => b.siteId === site.id)[Math.floor(i / sites.length) % o.baysPerSite];
    if (fixed.some((f) => f.bayId === bay.id || f.technicianId === tech.id || f.bikeId === bike.id)) continue;
    fixed.push({ id: `fixed-${i + 1}`, bikeId: bike.id, siteId: site.id, bayId: bay.id, technicianId: tech.id, start: shift.start, end: shift.start + 90 * 60_000, taskIds: [`fixed-task-${i + 1}`] });
  }
  return { from, to, sites, bays, technicians, bikes, demands, tasks, fixed, windowDays: 14, windowKm: 600 };
}

export interface PlannerFigures {
  bikes: number;
  tasks: number;
  bookings: number;
  fullMs: number;
  visits: number;
  unplaced: number;
  replanOneMs: number;
  floorObjective: number;
  objective: number;
  /** Lashline's objective term by term. */
  terms: PlanObjective;
  lpBound: number | null;
  lpStatus: string;
  /** Lashline's objective over the LP bound (1 is optimal). */
  ratio: number | null;
}

/**
 * The figures for the standard load: 2,000 bikes, two weeks, 2 sites × 6 bays × 8 technicians, 3,000
 * bookings, 1,000 due tasks of 30 minutes to 2 hours falling due over the next four weeks (so some
 * can wait for the next plan, as in a workshop that keeps up with its work).
 */
export async function measurePlanner(options: Partial<FleetOptions> = {}, lpSeconds = 60): Promise<PlannerFigures> {
  const input = generatePlanInput({ seed: 7, sites: 2, baysPerSite: 6, techsPerSite: 8, days: 14, bikes: 2000, tasks: 1000, bookings: 3000, dueWithinDays: 28, minutes: [30, 45, 60, 60, 90, 120], ...options });
  const t0 = performance.now();
  const plan = planWorkshop(input);
  const fullMs = performance.now() - t0;

  // Re-plan one bike with every other visit fixed where the full plan put it.
  const bikeId = plan.visits[Math.floor(plan.visits.length / 2)]?.bikeId ?? input.bikes[0].id;
  const others: FixedVisit[] = plan.visits.filter((v) => v.bikeId !== bikeId).map((v, i) => ({ id: `planned-${i}`, bikeId: v.bikeId, siteId: v.siteId, bayId: v.bayId, technicianId: v.technicianId, start: v.start, end: v.end, taskIds: v.taskIds }));
  const one: PlanInput = { ...input, fixed: [...input.fixed, ...others], tasks: input.tasks.filter((t) => t.bikeId === bikeId) };
  const t1 = performance.now();
  planWorkshop(one);
  const replanOneMs = performance.now() - t1;

  const floor = greedyPlan(input);
  const bound = await mipBound(input, { relax: true, timeLimit: lpSeconds });
  const objective = scalarObjective(plan.objective);
  const lpBound = bound.lpBound ?? (bound.status === 'Optimal' ? bound.objective : null);
  return {
    bikes: input.bikes.length,
    tasks: input.tasks.length,
    bookings: input.demands.length + input.bikes.reduce((n, b) => n + b.bookings.length, 0),
    fullMs: Math.round(fullMs),
    visits: plan.visits.length,
    unplaced: plan.unplaced.length,
    replanOneMs: Math.round(replanOneMs * 10) / 10,
    floorObjective: scalarObjective(floor.objective),
    objective,
    terms: plan.objective,
    lpBound,
    lpStatus: bound.status,
    ratio: lpBound && lpBound > 0 ? objective / lpBound : null,
  };
}

/**
 * Lashline against the HiGHS day-level optimum on small mixed instances (≤ 30 tasks, ≤ 3 bays,
 * 5 days, model bookings and overfull weeks included): the ratio of objectives, 1 at best.
 */
export async function measureSmall(count = 30): Promise<{ instances: number; median: number; worst: number; within5: number }> {
  const ratios: number[] = [];
  const rnd = seededRandom(2026);
  const int = (lo: number, hi: number) => lo + Math.floor(rnd() * (hi - lo + 1));
  for (let i = 0; i < count; i++) {
    const input = generatePlanInput({ seed: int(1, 1_000_000), sites: int(1, 2), baysPerSite: int(1, 3), techsPerSite: int(1, 3), days: 5, bikes: int(6, 16), tasks: int(4, 30), bookings: int(0, 20), fixed: int(0, 2) });
    const bound = await mipBound(input, { timeLimit: 20 });
    if (bound.status !== 'Optimal' || bound.objective <= 0) continue;
    ratios.push(scalarObjective(planWorkshop(input).objective) / bound.objective);
  }
  ratios.sort((a, b) => a - b);
  return { instances: ratios.length, median: ratios[Math.floor(ratios.length / 2)] ?? NaN, worst: ratios[ratios.length - 1] ?? NaN, within5: ratios.filter((r) => r <= 1.05).length };
}

if (process.argv[1]?.endsWith('plan-pure.ts')) {
  const f = await measurePlanner();
  console.log(`Planner on ${f.bikes} bikes, ${f.bookings} bookings, ${f.tasks} due tasks (2 sites × 6 bays × 8 technicians, 14 days)`);
  console.log(`  full plan            ${f.fullMs} ms: ${f.visits} visits, ${f.unplaced} tasks late or left out`);
  console.log(`  re-plan of one bike  ${f.replanOneMs} ms`);
  console.log(`  objective            floor (earliest due first) ${f.floorObjective.toFixed(1)}, Lashline ${f.objective.toFixed(1)}`);
  console.log(`  terms                ${JSON.stringify(f.terms)}`);
  console.log(`  LP bound             ${f.lpBound === null ? 'none' : f.lpBound.toFixed(1)} (${f.lpStatus}); ratio ${f.ratio === null ? '–' : f.ratio.toFixed(3)}`);
  const s = await measureSmall();
  console.log(`Small mixed instances against the HiGHS optimum: ${s.instances} solved, median ratio ${s.median.toFixed(3)}, worst ${s.worst.toFixed(3)}, ${s.within5} within 5 %`);
}
