import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { greedyShimPlan, planShims, type ShimPlan, type ShimPlanInput } from '../../shared/domain/shim-plan';
import { shimSizes } from '../../shared/domain/shims';

const SERIES = shimSizes({ minMm: 1.2, maxMm: 2.4, stepMm: 0.05 });
const SPEC = { specMinMm: 0.15, specMaxMm: 0.22 };
const um = (mm: number) => Math.round(mm * 1000);
const total = (lines: { count: number }[]) => lines.reduce((a, l) => a + l.count, 0);

function byId(plan: ShimPlan, id: string) {
  return plan.valves.find((v) => v.valveId === id)!;
}

describe('planShims', () => {
  // Shim arithmetic is common practice of shim-under-bucket adjustment:
  // expected = measured + (old − new); target the middle of 0.15–0.22 (0.185).
  it('swaps shims between two valves instead of buying', () => {
    const input: ShimPlanInput = {
      valves: [
        { valveId: 'in-1', currentShimMm: 1.6, measuredClearanceMm: 0.3, ...SPEC }, // wants 1.70 → 0.20
        { valveId: 'in-2', currentShimMm: 1.7, measuredClearanceMm: 0.1, ...SPEC }, // wants 1.60 → 0.20
      ],
      stock: [{ sizeMm: 1.6, count: 5 }, { sizeMm: 1.7, count: 5 }],
      sizesMm: SERIES,
    };
    const plan = planShims(input);
    expect(byId(plan, 'in-1')).toMatchObject({ action: 'replace', installMm: 1.7, source: 'engine', fromValveId: 'in-2', expectedClearanceMm: 0.2, removedShimMm: 1.6 });
    expect(byId(plan, 'in-2')).toMatchObject({ installMm: 1.6, source: 'engine', fromValveId: 'in-1', expectedClearanceMm: 0.2 });
    expect(plan).toMatchObject({ order: [], stockUsed: [], returnedToStock: [] });
  });

  it('reuses a removed shim at the edge of the spec rather than buying the nearest size', () => {
    const input: ShimPlanInput = {
      valves: [
        { valveId: 'ex-1', currentShimMm: 1.5, measuredClearanceMm: 0.3, ...SPEC }, // 1.60 → 0.20, 1.65 → 0.15
        { valveId: 'ex-2', currentShimMm: 1.65, measuredClearanceMm: 0.1, ...SPEC }, // 1.55 → 0.20, 1.60 → 0.15
      ],
      stock: [],
      sizesMm: SERIES,
    };
    const plan = planShims(input);
    expect(byId(plan, 'ex-1')).toMatchObject({ installMm: 1.65, source: 'engine', expectedClearanceMm: 0.15 });
    expect(byId(plan, 'ex-2')).toMatchObject({ installMm: 1.55, source: 'order', expectedClearanceMm: 0.2 });
    expect(plan.order).toEqual([{ sizeMm: 1.55, count: 1 }]);
    expect(plan.returnedToStock).toEqual([{ sizeMm: 1.5, count: 1 }]);
    const greedy = greedyShimPlan(input);
    expect(greedy.order).toEqual([{ sizeMm: 1.55, count: 1 }, { sizeMm: 1.6, count: 1 }]);
  });

  it('takes stock before ordering, used before new, and leaves in-spec and unfixable valves alone', () => {
    const plan = planShims({
      valves: [
        { valveId: 'a', currentShimMm: 1.55, measuredClearanceMm: 0.2, ...SPEC }, // in spec
        { valveId: 'b', currentShimMm: 1.55, measuredClearanceMm: 0.3, ...SPEC }, // wants 1.65
        { valveId: 'c', currentShimMm: 1.25, measuredClearanceMm: 0.05, ...SPEC }, // needs 1.115: below the series
      ],
      stock: [{ sizeMm: 1.65, count: 1, condition: 'new' }, { sizeMm: 1.65, count: 1, condition: 'used' }],
      sizesMm: SERIES,
    });
    expect(byId(plan, 'a')).toMatchObject({ action: 'keep', installMm: 1.55, source: null, removedShimMm: null, expectedClearanceMm: 0.2 });
    expect(byId(plan, 'b')).toMatchObject({ action: 'replace', installMm: 1.65, source: 'stock', condition: 'used', expectedClearanceMm: 0.2 });
    expect(byId(plan, 'c')).toMatchObject({ action: 'none-fits', installMm: null, source: null, removedShimMm: null });
    expect(plan.stockUsed).toEqual([{ sizeMm: 1.65, count: 1, condition: 'used' }]);
    expect(plan.returnedToStock).toEqual([{ sizeMm: 1.55, count: 1 }]);
    expect(plan.order).toEqual([]);
  });

  it('refuses a valve listed twice and a fractional stock count', () => {
    const v = { valveId: 'x', currentShimMm: 1.55, measuredClearanceMm: 0.3, ...SPEC };
    expect(() => planShims({ valves: [v, v], stock: [], sizesMm: SERIES })).toThrow(/twice/);
    expect(() => planShims({ valves: [v], stock: [{ sizeMm: 1.6, count: 0.5 }], sizesMm: SERIES })).toThrow(/whole number/);
  });
});

// Small random engines: sizes 1.50–1.80 by 0.05, some used shims measured off-series.
const SMALL = shimSizes({ minMm: 1.5, maxMm: 1.8, stepMm: 0.05 });
const sizeArb = fc.oneof(fc.constantFrom(...SMALL), fc.integer({ min: 1500, max: 1800 }).map((u) => u / 1000));
const engineArb: fc.Arbitrary<ShimPlanInput> = fc.record({
  valves: fc.array(
    fc.record({ cur: sizeArb, meas: fc.integer({ min: 5, max: 45 }), min: fc.constantFrom(100, 150), width: fc.constantFrom(50, 70, 100) }),
    { minLength: 1, maxLength: 5 },
  ).map((vs) => vs.map((v, i) => ({
    valveId: `v${i}`, currentShimMm: v.cur, measuredClearanceMm: v.meas / 100, specMinMm: v.min / 1000, specMaxMm: (v.min + v.width) / 1000,
  }))),
  stock: fc.array(fc.record({ sizeMm: sizeArb, count: fc.integer({ min: 0, max: 2 }), condition: fc.constantFrom('new' as const, 'used' as const) }), { maxLength: 3 }),
  sizesMm: fc.constant(SMALL),
});

/** Exhaustive search over every way to give each valve a shim: lexicographic (orders, stock, half-µm distance). */
function bruteForce(input: ShimPlanInput): [number, number, number] {
  const series = input.sizesMm.map(um);
  const valves = input.valves.map((v) => ({
    cur: um(v.currentShimMm), meas: um(v.measuredClearanceMm), min: um(v.specMinMm), max: um(v.specMaxMm),
    target: (um(v.specMinMm) + um(v.specMaxMm)) / 2,
  }));
  const fits = (v: (typeof valves)[number], size: number) => { const e = v.meas + v.cur - size; return e >= v.min && e <= v.max; };
  const rows = valves.filter((v) => !(v.meas >= v.min && v.meas <= v.max) && series.some((s) => fits(v, s)));
  const dist = (v: (typeof rows)[number], size: number) => Math.abs(2 * (v.meas + v.cur - size) - 2 * v.target);
  const stockLeft = input.stock.map((l) => l.count);
  const engineFree = rows.map(() => true);
  let best: [number, number, number] = [Infinity, Infinity, Infinity];
  const less = (a: number[], b: number[]) => a[0] !== b[0] ? a[0] < b[0] : a[1] !== b[1] ? a[1] < b[1] : a[2] < b[2];
  const go = (i: number, o: number, s: number, d: number) => {
    if (i === rows.length) { if (less([o, s, d], best)) best = [o, s, d]; return; }
    const v = rows[i];
    rows.forEach((other, k) => {
      if (k === i || !engineFree[k] || !fits(v, other.cur)) return;
      engineFree[k] = false; go(i + 1, o, s, d + dist(v, other.cur)); engineFree[k] = true;
    });
    input.stock.forEach((line, k) => {
      if (stockLeft[k] === 0 || !fits(v, um(line.sizeMm))) return;
      stockLeft[k]--; go(i + 1, o, s + 1, d + dist(v, um(line.sizeMm))); stockLeft[k]++;
    });
    go(i + 1, o + 1, s, d + Math.min(...series.filter((sz) => fits(v, sz)).map((sz) => dist(v, sz))));
  };
  go(0, 0, 0, 0);
  return rows.length === 0 ? [0, 0, 0] : best;
}

function score(input: ShimPlanInput, plan: ShimPlan): [number, number, number] {
  let d = 0;
  for (const p of plan.valves) {
    if (p.action !== 'replace') continue;
    const v = input.valves.find((x) => x.valveId === p.valveId)!;
    d += Math.abs(2 * um(p.expectedClearanceMm!) - (um(v.specMinMm) + um(v.specMaxMm)));
  }
  return [total(plan.order), total(plan.stockUsed), d];
}

function isConsistent(input: ShimPlanInput, plan: ShimPlan): boolean {
  const replaced = plan.valves.filter((p) => p.action === 'replace');
  const fromEngine = replaced.filter((p) => p.source === 'engine').map((p) => p.fromValveId);
  const inSpec = replaced.every((p) => {
    const v = input.valves.find((x) => x.valveId === p.valveId)!;
    const e = um(v.measuredClearanceMm) + um(v.currentShimMm) - um(p.installMm!);
    return e === um(p.expectedClearanceMm!) && e >= um(v.specMinMm) && e <= um(v.specMaxMm);
  });
  const engineOnce = new Set(fromEngine).size === fromEngine.length && fromEngine.every((id) => replaced.some((p) => p.valveId === id));
  const returned = total(plan.returnedToStock) + fromEngine.length === replaced.length;
  const stockOk = plan.stockUsed.every((u) => u.count <= total(input.stock.filter((l) => um(l.sizeMm) === um(u.sizeMm) && l.condition === u.condition)));
  return inSpec && engineOnce && returned && stockOk;
}

describe('planShims against exhaustive search (property)', () => {
  it('buys the fewest shims, then uses the least stock, then lands nearest the targets', () => {
    fc.assert(fc.property(engineArb, (input) => {
      const plan = planShims(input);
      expect(isConsistent(input, plan)).toBe(true);
      expect(score(input, plan)).toEqual(bruteForce(input));
    }), { numRuns: 300 });
  });

  it('never buys more than the valve-by-valve plan, and both plans fix the same valves', () => {
    fc.assert(fc.property(engineArb, (input) => {
      const [plan, greedy] = [planShims(input), greedyShimPlan(input)];
      expect(isConsistent(input, greedy)).toBe(true);
      expect(total(plan.order)).toBeLessThanOrEqual(total(greedy.order));
      expect(plan.valves.map((v) => v.action)).toEqual(greedy.valves.map((v) => v.action));
    }), { numRuns: 300 });
  });
});
