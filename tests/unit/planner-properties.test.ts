import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { checkPlacement, planWorkshop } from '../../shared/domain/planner';
import { generatePlanInput } from '../../bench/plan-pure';
import { brokenRules } from './planner-scene';

// Random fleets from a seeded generator; each plan is checked by brute force (every pair of visits,
// every instant where a count changes) in planner-scene.ts, apart from the planner's own structures.
const fleet = fc.record({
  seed: fc.integer({ min: 1, max: 1_000_000 }),
  sites: fc.integer({ min: 1, max: 2 }),
  baysPerSite: fc.integer({ min: 1, max: 3 }),
  techsPerSite: fc.integer({ min: 1, max: 3 }),
  days: fc.integer({ min: 3, max: 8 }),
  bikes: fc.integer({ min: 4, max: 30 }),
  tasks: fc.integer({ min: 1, max: 40 }),
  bookings: fc.integer({ min: 0, max: 40 }),
  perBikeShare: fc.double({ min: 0.3, max: 1, noNaN: true }),
  fixed: fc.integer({ min: 0, max: 3 }),
});
const RUNS = { numRuns: 100, seed: 20261207 };

describe('planWorkshop on random fleets', () => {
  it('keeps every hard rule: bays, shifts, bookings, model cover, one visit per bike at a time, fixed visits', () => {
    fc.assert(
      fc.property(fleet, (o) => {
        const input = generatePlanInput(o);
        const plan = planWorkshop(input);
        expect(brokenRules(input, plan)).toEqual([]);
      }),
      RUNS,
    );
  }, 30_000);

  it('gives the same plan for the same input', () => {
    fc.assert(
      fc.property(fleet, (o) => {
        const input = generatePlanInput(o);
        expect(planWorkshop(structuredClone(input))).toEqual(planWorkshop(input));
      }),
      { ...RUNS, numRuns: 40 },
    );
  }, 30_000);

  it('leaves fixed visits where they are and lists every task once: in a visit, or as unplaced with words', () => {
    fc.assert(
      fc.property(fleet, (o) => {
        const input = generatePlanInput({ ...o, fixed: 3 });
        const plan = planWorkshop(input);
        const ids = new Set(input.fixed.map((f) => f.id));
        expect(plan.visits.filter((v) => ids.has(v.key))).toEqual([]);
        const placed = new Set(plan.visits.flatMap((v) => v.taskIds));
        for (const t of input.tasks) {
          const u = plan.unplaced.find((x) => x.taskId === t.id);
          if (!placed.has(t.id)) expect(u).toBeDefined();
          if (u) {
            expect(u.reason.length).toBeGreaterThan(10);
            expect(u.remedy).toMatch(/\.$/);
          }
        }
        for (const v of plan.visits) expect(v.why.length).toBeGreaterThanOrEqual(2);
      }),
      { ...RUNS, numRuns: 40 },
    );
  }, 30_000);

  it('agrees with checkPlacement: every planned visit, checked against all the others, is allowed', () => {
    fc.assert(
      fc.property(fleet, (o) => {
        const input = generatePlanInput(o);
        const plan = planWorkshop(input);
        const asFixed = plan.visits.map((v) => ({ id: v.key, bikeId: v.bikeId, siteId: v.siteId, bayId: v.bayId, technicianId: v.technicianId, start: v.start, end: v.end, taskIds: v.taskIds }));
        for (const v of plan.visits.slice(0, 6)) {
          const safetyLate = input.tasks.some((t) => v.taskIds.includes(t.id) && t.safetyCritical && t.deadline < v.end);
          const clashes = checkPlacement({ ...input, fixed: [...input.fixed, ...asFixed] }, { id: v.key, bikeId: v.bikeId, taskIds: v.taskIds }, v);
          // A visit placed after a safety-critical item's due day is the one clash a plan may carry.
          expect(clashes.filter((c) => !(safetyLate && c.startsWith('That is after')))).toEqual([]);
        }
      }),
      { ...RUNS, numRuns: 40 },
    );
  }, 30_000);

  it('has a checker that sees a broken plan (two visits moved onto one bay and time, one onto a booking)', () => {
    const input = generatePlanInput({ seed: 11, sites: 1, baysPerSite: 2, techsPerSite: 2, days: 5, bikes: 10, tasks: 12, bookings: 10 });
    const plan = planWorkshop(input);
    const [a, b] = plan.visits;
    const clash = { ...b, bayId: a.bayId, start: a.start, end: a.start + (b.end - b.start) };
    expect(brokenRules(input, { ...plan, visits: [a, clash, ...plan.visits.slice(2)] })).toContain(`${a.key} and ${b.key} share a bay`);
    const booked = input.bikes.find((x) => x.bookings.length)!;
    const k = booked.bookings[0];
    const onHire = { ...a, bikeId: booked.id, start: k.start, end: k.start + (a.end - a.start) };
    expect(brokenRules(input, { ...plan, visits: [onHire] }).some((r) => r.includes('overlaps the bike') || r.includes('booking'))).toBe(true);
  });
});
