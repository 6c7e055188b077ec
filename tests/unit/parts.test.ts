import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { quantile } from 'simple-statistics';
import { addDays, format, startOfISOWeek } from 'date-fns';
import {
  judgeMovement,
  judgeReceipt,
  ledgerBalance,
  reorderPoint,
  safetyStock,
  suggestedOrder,
  MOVEMENT_KINDS,
  type MovementKind,
} from '../../shared/domain/parts';
import {
  dailyDistances,
  needWithin,
  quantileSorted,
  runsOutWeek,
  simulatePartUse,
  weekStartOf,
  weekTotals,
  weeklyNeed,
  type ForecastBikeInput,
} from '../../shared/domain/parts-forecast';

const iso = (d: Date) => format(d, 'yyyy-MM-dd');
const oil = { name: 'Engine oil 10W-40', unit: 'litre' as const };
const filter = { name: 'Oil filter', unit: 'each' as const };

describe('reorder point and safety stock', () => {
  it('is demand over the lead time plus safety stock, SS = k·σ·√L', () => {
    // The reorder point s = x̂_L + k·σ_L of a continuous-review system (Silver, Pyke & Thomas,
    // Inventory and Production Management in Supply Chains, 4th ed.; the formula as recalled from
    // memory, with a worked case of round numbers). Demand 200 a week, lead time 2 weeks, σ = 40 a
    // week, 95 % cycle service: k = 1.645 (standard normal table, any statistics handbook).
    const ss = safetyStock({ k: 1.645, sigmaPerPeriod: 40, leadTimePeriods: 2 });
    expect(ss).toBeCloseTo(93.055, 3); // 1.645 × 40 × 1.414214
    expect(reorderPoint({ demandPerPeriod: 200, leadTimePeriods: 2, safetyStock: ss })).toBeCloseTo(493.055, 3);
    // Without variability the reorder point is just the lead-time demand.
    expect(reorderPoint({ demandPerPeriod: 12, leadTimePeriods: 3, safetyStock: 0 })).toBe(36);
  });

  it('the simulated cautious need over a lead time agrees with x̂_L + 1.2816·σ_L for many independent riders', () => {
    // 400 bikes, each needing one filter with probability ½ inside the lead time (a share of 0.5 on
    // a service every bike has due): the total is binomial, n = 400, p = ½, mean 200, σ = 10. Its P90
    // is about 200 + 1.2816 × 10 (normal approximation; z for 90 % from the standard normal table).
    const bikes: ForecastBikeInput[] = Array.from({ length: 400 }, (_, i) => ({
      bikeId: `b${i}`, siteId: 's', currentKm: 0, dailyKm: [],
      items: [{ serviceItemId: 'oil', everyKm: null, everyMonths: null, nextDueKm: null, nextDueDate: '2026-12-08', plannedDate: null, parts: [{ partId: 'f', quantity: 1, share: 0.5 }] }],
    }));
    const s = simulatePartUse(bikes, { today: '2026-11-30', weeks: 2, runs: 400, seed: 'binomial' });
    expect(s.days).toBe(14);
    const line = s.lines[0];
    const p90 = needWithin(s, line, 14);
    expect(Math.abs(p90 - (200 + 1.2816 * 10))).toBeLessThan(4);
    expect(Math.abs(needWithin(s, line, 14, 0.5) - 200)).toBeLessThan(3);
  });
});

describe('suggested order', () => {
  it('orders the cautious lead-time need plus the minimum, less on hand and on order, in whole packs', () => {
    // 9.4 L over the lead time + 5 L minimum − 6 L on hand − 0 on order = 8.4 L → two 5 L cans.
    expect(suggestedOrder({ leadTimeNeed: 9.4, minimum: 5, onHand: 6, onOrder: 0, packSize: 5 })).toEqual({ quantity: 10, packs: 2 });
    // Exactly a pack short is one pack, not two.
    expect(suggestedOrder({ leadTimeNeed: 10, minimum: 0, onHand: 0, onOrder: 0, packSize: 10 })).toEqual({ quantity: 10, packs: 1 });
    // Covered by what is on order: nothing.
    expect(suggestedOrder({ leadTimeNeed: 4, minimum: 2, onHand: 1, onOrder: 5, packSize: 1 })).toEqual({ quantity: 0, packs: 0 });
  });
});

describe('quantiles', () => {
  it('match simple-statistics quantile (type 7) on any sample', () => {
    // simple-statistics 7.12 `quantile` (general-purpose reference library).
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 0, max: 1000 }), { minLength: 1, maxLength: 60 }), fc.double({ min: 0, max: 1, noNaN: true }), (xs, p) => {
        const sorted = [...xs].sort((a, b) => a - b);
        expect(quantileSorted(sorted, p)).toBeCloseTo(quantile(xs, p), 9);
      }),
    );
  });

  it('the weekly P50 and P90 are simple-statistics quantiles of the same runs', () => {
    const rng = (i: number) => [0, 0, 20 + (i % 7) * 30, 80, 0, 140, 10];
    const bikes: ForecastBikeInput[] = Array.from({ length: 30 }, (_, i) => ({
      bikeId: `b${i}`, siteId: 's', currentKm: 1000 * i, dailyKm: rng(i),
      items: [{ serviceItemId: 'oil', everyKm: 1500, everyMonths: 6, nextDueKm: 1000 * i + 200 * (i % 5), nextDueDate: '2027-03-01', plannedDate: null, parts: [{ partId: 'oil', quantity: 1.1, share: 1 }, { partId: 'pads', quantity: 1, share: 0.3 }] }],
    }));
    const s = simulatePartUse(bikes, { today: '2026-12-03', weeks: 8, runs: 120, seed: 'q' });
    expect(s.lines.map((l) => l.partId)).toEqual(['oil', 'pads']);
    for (const line of s.lines) {
      const totals = weekTotals(s, line);
      const need = weeklyNeed(s, line);
      need.forEach((w, i) => {
        expect(w.p50).toBeCloseTo(quantile(totals[i], 0.5), 3);
        expect(w.p90).toBeCloseTo(quantile(totals[i], 0.9), 3);
        expect(w.p90).toBeGreaterThanOrEqual(w.p50);
      });
      // The running figures are quantiles of the running totals, and never fall.
      for (let i = 1; i < need.length; i++) expect(need[i].cumulativeP90).toBeGreaterThanOrEqual(need[i - 1].cumulativeP90);
      const running = totals.reduce<number[]>((acc, week) => week.map((v, r) => (acc[r] ?? 0) + v), []);
      expect(need[7].cumulativeP90).toBeCloseTo(quantile(running, 0.9), 3);
    }
  });
});

describe('the forecast of service work', () => {
  it('weeks start on Monday (date-fns startOfISOWeek) and the first is this week', () => {
    for (const d of ['2026-12-03', '2026-12-07', '2026-12-06', '2027-01-01']) expect(weekStartOf(d)).toBe(iso(startOfISOWeek(new Date(`${d}T12:00:00`))));
    const s = simulatePartUse([], { today: '2026-12-03', weeks: 3 });
    expect(s.weekStarts).toEqual(['2026-11-30', '2026-12-07', '2026-12-14']);
    expect(s.days).toBe(21 - 3);
  });

  it('a bike riding 100 km every day needs its 1,000 km service on day 10 and every ten days after', () => {
    const bike: ForecastBikeInput = {
      bikeId: 'b', siteId: 's', currentKm: 5000, dailyKm: [100],
      items: [{ serviceItemId: 'chain', everyKm: 1000, everyMonths: null, nextDueKm: 6000, nextDueDate: null, plannedDate: null, parts: [{ partId: 'lube', quantity: 0.05, share: 1 }] }],
    };
    const s = simulatePartUse([bike], { today: '2026-12-07', weeks: 4, runs: 5 });
    const days = Array.from(s.lines[0].perRunDay.slice(0, s.days)).flatMap((v, d) => (v ? [d] : []));
    // End of day d holds 5,000 + 100·(d + 1) km: 6,000 at d = 9, 7,000 at d = 19 (weeks from Monday 7 Dec: the 2nd and 3rd).
    expect(days).toEqual([9, 19]);
    expect(weeklyNeed(s, s.lines[0]).map((w) => w.p50)).toEqual([0, 0.05, 0.05, 0]);
  });

  it('a calendar item falls in the week of its date, and again after its months (date-fns addMonths)', () => {
    const bike: ForecastBikeInput = {
      bikeId: 'b', siteId: 's', currentKm: 0, dailyKm: [],
      items: [{ serviceItemId: 'fluid', everyKm: null, everyMonths: 1, nextDueKm: null, nextDueDate: '2026-12-10', plannedDate: null, parts: [{ partId: 'dot4', quantity: 0.5, share: 1 }] }],
    };
    const s = simulatePartUse([bike], { today: '2026-12-03', weeks: 8, runs: 3 });
    const weeks = weeklyNeed(s, s.lines[0]);
    const again = iso(startOfISOWeek(addDays(new Date('2027-01-10T12:00:00'), 0)));
    expect(weeks.filter((w) => w.p50 > 0).map((w) => w.weekStart)).toEqual(['2026-12-07', again]);
  });

  it('a service the workshop plan has placed counts on its planned day, and an overdue one today', () => {
    const item = { serviceItemId: 'oil', everyKm: 5000, everyMonths: 6, nextDueKm: 100, nextDueDate: '2026-11-01', parts: [{ partId: 'oil', quantity: 1, share: 1 }] };
    const s = simulatePartUse(
      [
        { bikeId: 'late', siteId: 's', currentKm: 900, dailyKm: [0], items: [{ ...item, plannedDate: null }] },
        { bikeId: 'planned', siteId: 's', currentKm: 900, dailyKm: [0], items: [{ ...item, plannedDate: '2026-12-15' }] },
      ],
      { today: '2026-12-03', weeks: 4, runs: 2 },
    );
    expect(weeklyNeed(s, s.lines[0]).map((w) => w.p50)).toEqual([1, 0, 1, 0]);
  });

  it('the same inputs give the same forecast', () => {
    const bike: ForecastBikeInput = {
      bikeId: 'b', siteId: 's', currentKm: 0, dailyKm: [0, 50, 200, 0, 90],
      items: [{ serviceItemId: 'i', everyKm: 800, everyMonths: null, nextDueKm: 500, nextDueDate: null, plannedDate: null, parts: [{ partId: 'p', quantity: 1, share: 0.5 }] }],
    };
    const a = simulatePartUse([bike], { today: '2026-12-03', weeks: 6, seed: 'x' });
    const b = simulatePartUse([bike], { today: '2026-12-03', weeks: 6, seed: 'x' });
    expect(weeklyNeed(a, a.lines[0])).toEqual(weeklyNeed(b, b.lines[0]));
  });

  it('runs out in the first week whose cautious running need passes the shelf', () => {
    const weeks = [
      { weekStart: '2026-11-30', p50: 2, p90: 3, cumulativeP50: 2, cumulativeP90: 3 },
      { weekStart: '2026-12-07', p50: 2, p90: 3, cumulativeP50: 4, cumulativeP90: 6 },
    ];
    expect(runsOutWeek(weeks, 5)).toBe('2026-12-07');
    expect(runsOutWeek(weeks, 6)).toBeNull();
  });

  it('spreads each stretch between check-ins evenly over its days', () => {
    expect(dailyDistances([{ date: '2026-11-01', odometerKm: 0 }, { date: '2026-11-05', odometerKm: 200 }, { date: '2026-11-06', odometerKm: 260 }])).toEqual([50, 50, 50, 50, 60]);
    expect(dailyDistances([{ date: '2026-11-01', odometerKm: 0 }])).toEqual([]);
  });
});

describe('the stock ledger', () => {
  it('refuses a negative quantity, another unit, half a filter and more out than is on hand, in words', () => {
    expect(judgeMovement(oil, 5, { kind: 'received', quantity: -1, unit: 'litre' })).toMatchObject({ ok: false, error: expect.stringMatching(/cannot be negative/) });
    expect(judgeMovement(oil, 5, { kind: 'used', quantity: 1, unit: 'each' })).toMatchObject({ ok: false, error: expect.stringMatching(/counted in litres, not pieces/) });
    expect(judgeMovement(filter, 5, { kind: 'used', quantity: 0.5, unit: 'each' })).toMatchObject({ ok: false, error: expect.stringMatching(/whole pieces/) });
    expect(judgeMovement(oil, 1, { kind: 'used', quantity: 1.1, unit: 'litre' })).toMatchObject({ ok: false, error: expect.stringMatching(/Only 1 L .* 1.1 L cannot go out/) });
    expect(judgeMovement(oil, 5, { kind: 'used', quantity: 1.1, unit: 'litre' })).toEqual({ ok: true, delta: -1.1 });
    expect(judgeMovement(oil, 5, { kind: 'stock-take', quantity: 3.5, unit: 'litre' })).toEqual({ ok: true, delta: -1.5 });
  });

  it('after any sequence of movements the ledger sum is on hand, and never below zero', () => {
    const move = fc.record({ kind: fc.constantFrom(...MOVEMENT_KINDS), quantity: fc.integer({ min: -3, max: 40 }) });
    fc.assert(
      fc.property(fc.array(move, { maxLength: 60 }), (moves) => {
        let onHand = 0;
        const ledger: { delta: number }[] = [];
        for (const m of moves) {
          const v = judgeMovement(filter, onHand, { kind: m.kind as MovementKind, quantity: m.quantity, unit: 'each' });
          if (!v.ok) continue;
          ledger.push({ delta: v.delta });
          onHand += v.delta;
          expect(onHand).toBeGreaterThanOrEqual(0);
        }
        expect(ledgerBalance(ledger)).toBe(onHand);
      }),
    );
  });

  it('a receipt cannot exceed what is still due, and completes the order when every line is in', () => {
    const lines = [{ partId: 'a', quantity: 10, received: 4 }, { partId: 'b', quantity: 2, received: 0 }];
    const name = (id: string) => `part ${id}`;
    expect(judgeReceipt('sent', lines, [{ partId: 'a', quantity: 7 }], name)).toMatchObject({ ok: false, error: expect.stringMatching(/only 6 is still due/) });
    expect(judgeReceipt('draft', lines, [{ partId: 'a', quantity: 1 }], name)).toMatchObject({ ok: false });
    expect(judgeReceipt('sent', lines, [{ partId: 'c', quantity: 1 }], name)).toMatchObject({ ok: false, error: 'part c is not on this order.' });
    expect(judgeReceipt('sent', lines, [{ partId: 'a', quantity: 6 }], name)).toEqual({ ok: true, state: 'part-received' });
    expect(judgeReceipt('part-received', lines, [{ partId: 'a', quantity: 6 }, { partId: 'b', quantity: 2 }], name)).toEqual({ ok: true, state: 'received' });
  });
});

describe('the seasonal factor of the forecast', () => {
  it('scales the coming days by how a year ago rode after the same day against before it, worked by hand', async () => {
    const { seasonalFactor, yearAgoDays } = await import('../../shared/domain/parts-forecast');
    const { subDays, addDays, format } = await import('date-fns');
    // Three bikes a year back: 900, 1,800 and 900 km over a 90-day window (3,600 km / 270 bike-days =
    // 13.33 km a bike-day), then 100, 200 and 100 km over a 30-day horizon (400 km / 90 bike-days =
    // 4.44 km a bike-day): the coming days ride a third as far.
    const bikes = [
      { atWindowStart: 1000, atYearAgo: 1900, atHorizonEnd: 2000 },
      { atWindowStart: 5000, atYearAgo: 6800, atHorizonEnd: 7000 },
      { atWindowStart: 0, atYearAgo: 900, atHorizonEnd: 1000 },
    ];
    expect(seasonalFactor(bikes, 90, 30)).toBeCloseTo((400 / 90) / (3600 / 270), 12);
    expect(seasonalFactor(bikes, 90, 30)).toBeCloseTo(1 / 3, 12);
    // A bike without a reading a year back does not count; fewer than three: no season is judged.
    expect(seasonalFactor([...bikes.slice(0, 2), { atWindowStart: null, atYearAgo: 10, atHorizonEnd: 20 }], 90, 30)).toBe(1);
    // A freak year is held within 0.25–2.
    expect(seasonalFactor(bikes.map((b) => ({ ...b, atHorizonEnd: b.atYearAgo })), 90, 30)).toBe(0.25);
    expect(seasonalFactor(bikes.map((b) => ({ ...b, atHorizonEnd: b.atYearAgo! + 10_000 })), 90, 30)).toBe(2);
    // The days it reads, checked with date-fns: 365 days back, the window before it, the horizon after.
    const d = yearAgoDays('2026-12-04', 90, 56);
    const back = subDays(new Date(2026, 11, 4), 365);
    expect(d).toEqual({ windowStart: format(subDays(back, 90), 'yyyy-MM-dd'), yearAgo: format(back, 'yyyy-MM-dd'), horizonEnd: format(addDays(back, 56), 'yyyy-MM-dd') });
  });
});
