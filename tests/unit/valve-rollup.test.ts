import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { median as ssMedian } from 'simple-statistics';
import { median, rollUp, type BikeGroupRate } from '../../shared/domain/valve-rollup';
import { currentShim, valveLayout, valveHistories } from '../../shared/domain/valves';

describe('median', () => {
  it('agrees with simple-statistics median (general-purpose reference)', () => {
    fc.assert(fc.property(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 1, maxLength: 30 }), (xs) => {
      expect(median(xs)).toBeCloseTo(ssMedian(xs), 12);
    }));
    expect(median([])).toBeNull();
  });
});

const rate = (modelId: string, position: string, r: number | null): BikeGroupRate => ({
  modelId, modelName: 'Twin', position, rateMmPer1000Km: r, specMinMm: 0.2, specMaxMm: 0.3, intervalKm: 24000,
});

describe('fleet roll-up of closing valves', () => {
  it('flags a position where most bikes close up a quarter of the spec range within one interval', () => {
    // 0.0012 mm per 1,000 km over 24,000 km = 0.0288 mm, more than a quarter of 0.10 mm.
    const rows = rollUp([rate('m', 'Cylinder 2 exhaust', 0.0012), rate('m', 'Cylinder 2 exhaust', 0.0014), rate('m', 'Cylinder 2 exhaust', 0.001), rate('m', 'Cylinder 1 intake', 0.0001), rate('m', 'Cylinder 1 intake', null)]);
    const ex = rows.find((r) => r.position === 'Cylinder 2 exhaust')!;
    expect(ex).toMatchObject({ bikes: 3, tightening: 3, flagged: true });
    expect(ex.medianMmPer1000Km).toBeCloseTo(0.0012, 12);
    expect(ex.suggestion).toContain('Bring the valve checks forward');
    const intake = rows.find((r) => r.position === 'Cylinder 1 intake')!;
    expect(intake).toMatchObject({ bikes: 1, tightening: 0, flagged: false, suggestion: null });
    expect(rows[0].flagged).toBe(true);
  });

  it('does not flag one bike alone, however fast it closes', () => {
    expect(rollUp([rate('m', 'Exhaust', 0.01)])[0].flagged).toBe(false);
  });
});

describe('valve layout', () => {
  it('lists every valve of a parallel twin with four valves a cylinder, intake then exhaust', () => {
    const slots = valveLayout({ cylinders: 2, intakeValvesPerCylinder: 2, exhaustValvesPerCylinder: 2, intakeMinMm: 0.1, intakeMaxMm: 0.2, exhaustMinMm: 0.2, exhaustMaxMm: 0.3 });
    expect(slots).toHaveLength(8);
    expect(slots.map((s) => s.label)).toEqual(['Cylinder 1 intake 1', 'Cylinder 1 intake 2', 'Cylinder 1 exhaust 1', 'Cylinder 1 exhaust 2', 'Cylinder 2 intake 1', 'Cylinder 2 intake 2', 'Cylinder 2 exhaust 1', 'Cylinder 2 exhaust 2']);
    expect(slots[6]).toMatchObject({ specMinMm: 0.2, specMaxMm: 0.3 });
    const single = valveLayout({ cylinders: 1, intakeValvesPerCylinder: 1, exhaustValvesPerCylinder: 1, intakeMinMm: 0.05, intakeMaxMm: 0.09, exhaustMinMm: 0.08, exhaustMaxMm: 0.12 });
    expect(single.map((s) => s.label)).toEqual(['Intake', 'Exhaust']);
  });

  it('knows the shim in a valve now: the last fitted, else the last read off', () => {
    const h = valveHistories([
      { odometerKm: 20000, date: '2025-01-01', cylinder: 1, side: 'exhaust', position: 1, asFoundMm: 0.18, asLeftMm: 0.25, shimBeforeMm: 2.6, shimAfterMm: 2.55 },
      { odometerKm: 1000, date: '2024-01-01', cylinder: 1, side: 'exhaust', position: 1, asFoundMm: 0.26, asLeftMm: null, shimBeforeMm: 2.6, shimAfterMm: null },
    ]).get('c1-exhaust-1')!;
    expect(h.map((p) => p.odometerKm)).toEqual([1000, 20000]);
    expect(currentShim(h)).toBe(2.55);
    expect(currentShim(h.slice(0, 1))).toBe(2.6);
    expect(currentShim([])).toBeNull();
  });
});
