import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { planWorkshop } from '../../shared/domain/planner';
import { buildDayModel, mipBound, scalarObjective } from '../../shared/domain/plan-mip';
import { generatePlanInput } from '../../bench/plan-pure';

// Source: HiGHS (the `highs` package, MIP solver) solving the day-level model of the same instance.
// That model is a relaxation of the timed plan, so its optimum is a lower bound on any timed plan's
// scalar objective: Lashline's plan must be at or above it, and close to it.
const small = fc.record({
  seed: fc.integer({ min: 1, max: 1_000_000 }),
  sites: fc.integer({ min: 1, max: 2 }),
  baysPerSite: fc.integer({ min: 1, max: 3 }),
  techsPerSite: fc.integer({ min: 1, max: 3 }),
  days: fc.constant(5),
  bikes: fc.integer({ min: 6, max: 16 }),
  tasks: fc.integer({ min: 4, max: 30 }),
  bookings: fc.integer({ min: 0, max: 20 }),
  fixed: fc.integer({ min: 0, max: 2 }),
});

/** Share of the technicians' working minutes that the due work takes. */
function load(o: ReturnType<typeof generatePlanInput>): number {
  const work = o.tasks.reduce((n, t) => n + t.minutes, 0);
  const hours = o.technicians.reduce((n, t) => n + t.shifts.reduce((m, x) => m + (x.end - x.start) / 60_000, 0), 0);
  return work / hours;
}

describe('the planner against the HiGHS day-level optimum', () => {
  // The day-level model cannot see two visits wanting the same hour of a day, so where bookings of a
  // model share out the hours (booked hours lost) or work overfills the week (packing whole visits
  // into days), its bound lies below what any timed plan reaches. The 5 % check therefore runs on
  // fleets whose bookings name one bike each and whose work fits the week with room (≤ 70 % of the
  // technicians' hours); bench/plan-pure.ts prints the ratio on the full mix too.
  it('stays within 5 % of the optimum on small instances (≤ 30 tasks, ≤ 3 bays, 5 days), never below it', async () => {
    const cases = fc
      .sample(small, { numRuns: 120, seed: 5301 })
      .map((o) => generatePlanInput({ ...o, perBikeShare: 1 }))
      .filter((input) => load(input) <= 0.7)
      .slice(0, 40);
    expect(cases.length).toBeGreaterThanOrEqual(30);
    let worst = 1;
    for (const input of cases) {
      const plan = planWorkshop(input);
      const bound = await mipBound(input, { timeLimit: 20 });
      expect(bound.status).toBe('Optimal');
      const ratio = scalarObjective(plan.objective) / bound.objective;
      worst = Math.max(worst, ratio);
      expect(ratio).toBeGreaterThanOrEqual(1);
      expect(ratio, JSON.stringify(plan.objective)).toBeLessThanOrEqual(1.05);
    }
    console.log(`Worst ratio of Lashline's objective to the HiGHS optimum: ${worst.toFixed(4)} over ${cases.length} instances`);
  }, 60_000);

  it('has no safety-critical lateness whenever HiGHS finds a day-level plan without any', async () => {
    const cases = fc.sample(small, { numRuns: 40, seed: 9917 });
    let withoutLateness = 0;
    for (const o of cases) {
      const input = generatePlanInput(o);
      const bound = await mipBound(input, { timeLimit: 20 });
      if (bound.safetyLateDays !== 0) continue;
      withoutLateness++;
      expect(planWorkshop(input).objective.safetyLateDays, `seed ${o.seed}`).toBe(0);
    }
    expect(withoutLateness).toBeGreaterThan(10);
  }, 60_000);

  it('is a relaxation: the LP bound is at most the whole-number optimum, and a planned visit has a column on its day', async () => {
    const input = generatePlanInput({ seed: 42, sites: 1, baysPerSite: 2, techsPerSite: 2, days: 5, bikes: 10, tasks: 20, bookings: 12 });
    const mip = await mipBound(input, { timeLimit: 20 });
    const lp = await mipBound(input, { relax: true, timeLimit: 20 });
    expect(lp.objective).toBeLessThanOrEqual(mip.found! + 1e-6);
    expect(mip.objective).toBeLessThanOrEqual(mip.found!);
    const model = buildDayModel(input);
    const plan = planWorkshop(input);
    const day = (ms: number) => new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/London' }).format(new Date(ms));
    for (const v of plan.visits) {
      const gi = model.groups.findIndex((g) => g.key === v.key);
      expect(model.columns.some((c) => c.group === gi && c.day === day(v.start) && input.technicians[c.tech].id === v.technicianId)).toBe(true);
    }
  }, 60_000);
});
