import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { linearRegression } from 'simple-statistics';
import { clearanceTrend, leastSquares, theilSen } from '../../shared/domain/trend';

// Worked example (trade-references.md, "Trend statistics"): x in thousand km, y in mm.
const X = [0, 6, 12, 18, 24];
const Y = [0.25, 0.24, 0.22, 0.21, 0.18];
const Y_BAD = [0.25, 0.24, 0.22, 0.21, 0.3];

describe('theilSen (Theil 1950; Sen 1968, JASA 63:1379–1389)', () => {
  it('matches the worked example: slope −0.0027083, intercept 0.2525', () => {
    // By hand, the ten pairwise slopes (yj − yi)/(xj − xi):
    //   (0,6) −0.01/6 = −0.0016667   (0,12) −0.03/12 = −0.0025   (0,18) −0.04/18 = −0.0022222
    //   (0,24) −0.07/24 = −0.0029167 (6,12) −0.02/6 = −0.0033333 (6,18) −0.03/12 = −0.0025
    //   (6,24) −0.06/18 = −0.0033333 (12,18) −0.01/6 = −0.0016667 (12,24) −0.04/12 = −0.0033333
    //   (18,24) −0.03/6 = −0.005
    // Sorted: −0.005, −0.0033333 ×3, −0.0029167, −0.0025, −0.0025, −0.0022222, −0.0016667 ×2;
    // median = mean of 5th and 6th = (−0.0029167 − 0.0025)/2 = −0.0027083.
    // Intercept: y − b·x = 0.25, 0.25625, 0.2525, 0.25875, 0.245 → median 0.2525.
    const line = theilSen(X, Y);
    expect(line.slope).toBeCloseTo(-0.0027083, 7);
    expect(line.intercept).toBeCloseTo(0.2525, 7);
  });

  it('stays negative when the last reading is replaced by a bad 0.30 (−0.0016667)', () => {
    // The four slopes to x = 24 turn positive (+0.0020833, +0.0033333, +0.0066667, +0.015);
    // sorted, the 5th and 6th of ten are both −0.0016667.
    expect(theilSen(X, Y_BAD).slope).toBeCloseTo(-0.0016667, 7);
  });

  it('skips pairs with equal x, and refuses data with a single x', () => {
    expect(theilSen([0, 0, 10], [1, 3, 2]).slope).toBeCloseTo(0, 12); // slopes +0.1 and −0.1
    expect(() => theilSen([5, 5, 5], [1, 2, 3])).toThrow(RangeError);
  });
});

describe('leastSquares (reference: simple-statistics linearRegression)', () => {
  it('matches the worked example: slope −0.0028333, intercept 0.254; with the bad reading +0.0011667', () => {
    expect(leastSquares(X, Y).slope).toBeCloseTo(-0.0028333, 7);
    expect(leastSquares(X, Y).intercept).toBeCloseTo(0.254, 7);
    expect(leastSquares(X, Y_BAD).slope).toBeCloseTo(0.0011667, 7);
  });

  it('agrees with simple-statistics on random data (property)', () => {
    const pt = fc.tuple(fc.integer({ min: 0, max: 100_000 }), fc.integer({ min: -500, max: 500 }));
    fc.assert(fc.property(fc.array(pt, { minLength: 2, maxLength: 12 }), (pts) => {
      fc.pre(new Set(pts.map((p) => p[0])).size > 1);
      const xs = pts.map((p) => p[0] / 1000);
      const ys = pts.map((p) => p[1] / 1000);
      const ours = leastSquares(xs, ys);
      const ref = linearRegression(xs.map((x, i) => [x, ys[i]]));
      expect(ours.slope).toBeCloseTo(ref.m, 9);
      expect(ours.intercept).toBeCloseTo(ref.b, 9);
    }));
  });
});

describe('clearanceTrend', () => {
  // A reshimmed valve keeps wearing: trend the cumulative closure across adjustments
  // (trade-references.md, "Trend statistics").
  const reshimmed = [
    { odometerKm: 0, asFoundMm: 0.25 },
    { odometerKm: 12_000, asFoundMm: 0.21, asLeftMm: 0.27 },
    { odometerKm: 24_000, asFoundMm: 0.23 },
    { odometerKm: 36_000, asFoundMm: 0.19 },
  ];

  it('sums closure across a reshim and projects the km at spec minimum', () => {
    const t = clearanceTrend(reshimmed, { specMinMm: 0.15, nextCheckKm: 60_000 });
    expect(t.cumulative).toEqual([
      { odometerKm: 0, closureMm: 0 }, { odometerKm: 12_000, closureMm: 0.04 },
      { odometerKm: 24_000, closureMm: 0.08 }, { odometerKm: 36_000, closureMm: 0.12 },
    ]);
    // 0.04 mm per 12,000 km; 0.04 mm left above 0.15 → 12,000 km more.
    expect(t.closureMmPer1000Km).toBeCloseTo(0.04 / 12, 9);
    expect(t).toMatchObject({ kmAtSpecMin: 48_000, tightening: true, warning: true });
  });

  it('does not warn when the minimum comes at or after the next check', () => {
    expect(clearanceTrend(reshimmed, { specMinMm: 0.15, nextCheckKm: 48_000 }).warning).toBe(false);
    expect(clearanceTrend(reshimmed, { specMinMm: 0.15 }).warning).toBe(false);
  });

  it('reports the least-squares slope of the same series, as simple-statistics computes it', () => {
    const t = clearanceTrend(reshimmed, { specMinMm: 0.15 });
    const ref = linearRegression(t.cumulative.map((c) => [c.odometerKm / 1000, c.closureMm]));
    expect(t.leastSquaresMmPer1000Km).toBeCloseTo(ref.m, 12);
    expect(t.leastSquaresInterceptMm).toBeCloseTo(ref.b, 12);
  });

  it('keeps calling the worked example tightening despite one bad reading, where least squares flips', () => {
    const checks = (ys: number[]) => ys.map((y, i) => ({ odometerKm: X[i] * 1000, asFoundMm: y }));
    const good = clearanceTrend(checks(Y), { specMinMm: 0.15 });
    expect(good.closureMmPer1000Km).toBeCloseTo(0.0027083, 7);
    expect(good.leastSquaresMmPer1000Km).toBeCloseTo(0.0028333, 7);
    expect(good.kmAtSpecMin).toBe(Math.round(24_000 + (0.03 / (0.0325 / 12)) * 1000)); // 35,077
    const bad = clearanceTrend(checks(Y_BAD), { specMinMm: 0.15 });
    expect(bad.closureMmPer1000Km).toBeCloseTo(0.0016667, 7);
    expect(bad.leastSquaresMmPer1000Km).toBeCloseTo(-0.0011667, 7);
    expect(bad.tightening).toBe(true);
  });

  it('gives no trend with fewer than three checks, but still the cumulative series', () => {
    const t = clearanceTrend(reshimmed.slice(0, 2), { specMinMm: 0.3, nextCheckKm: 20_000 });
    expect(t).toMatchObject({ closureMmPer1000Km: null, leastSquaresMmPer1000Km: null, kmAtSpecMin: null, tightening: false, warning: false });
    expect(t.cumulative).toHaveLength(2);
  });

  it('returns null km for a loosening or flat valve, and the last odometer when already at the minimum', () => {
    const loosening = [0.1, 0.12, 0.14].map((y, i) => ({ odometerKm: i * 10_000, asFoundMm: y }));
    expect(clearanceTrend(loosening, { specMinMm: 0.05 })).toMatchObject({ tightening: false, kmAtSpecMin: null, warning: false });
    // 0.001 mm over 20,000 km is 0.00005 mm per 1,000 km: under the flat threshold.
    const flat = [0.2, 0.2, 0.199].map((y, i) => ({ odometerKm: i * 10_000, asFoundMm: y }));
    expect(clearanceTrend(flat, { specMinMm: 0.15 })).toMatchObject({ tightening: false, kmAtSpecMin: null });
    const atMin = [0.2, 0.17, 0.15].map((y, i) => ({ odometerKm: i * 10_000, asFoundMm: y }));
    expect(clearanceTrend(atMin, { specMinMm: 0.15 })).toMatchObject({ kmAtSpecMin: 20_000, warning: true });
  });

  it('projects from the as-left clearance of the last check', () => {
    const t = clearanceTrend([...reshimmed.slice(0, 3), { odometerKm: 36_000, asFoundMm: 0.19, asLeftMm: 0.23 }], { specMinMm: 0.15 });
    expect(t.kmAtSpecMin).toBe(36_000 + 24_000); // 0.08 mm above minimum at 0.04 mm per 12,000 km
  });

  it('takes checks in odometer order whatever order they arrive in', () => {
    const t = clearanceTrend([...reshimmed].reverse(), { specMinMm: 0.15 });
    expect(t.cumulative.map((c) => c.closureMm)).toEqual([0, 0.04, 0.08, 0.12]);
  });
});
