import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  bladeSeries, clearanceFromFeelers, FeelerReadingError, INCH_BLADES_IN, METRIC_BLADES_MM, nextBladeUp,
} from '../../shared/domain/feeler';
import { inchToMicrons, toMicrons } from '../../shared/domain/microns';

describe('clearanceFromFeelers', () => {
  // Common practice: the clearance is the thickest blade that slides in with a
  // light drag; the next blade up does not enter.
  it('reads the sliding blade as the clearance, range up to the blade that stops', () => {
    expect(clearanceFromFeelers({ slidesMm: 0.2, stopsMm: 0.25 })).toEqual({ minMm: 0.2, maxMm: 0.25, estimateMm: 0.2 });
  });

  it('leaves the top of the range open when no stopping blade was tried', () => {
    expect(clearanceFromFeelers({ slidesMm: 0.15, stopsMm: null })).toEqual({ minMm: 0.15, maxMm: null, estimateMm: 0.15 });
  });

  it('reads 0 when not even the thinnest blade enters (the loose-valve side is the safe error)', () => {
    expect(clearanceFromFeelers({ slidesMm: null, stopsMm: 0.02 })).toEqual({ minMm: 0, maxMm: 0.02, estimateMm: 0 });
  });

  it('refuses an empty reading and a sliding blade not thinner than the stopping one', () => {
    expect(() => clearanceFromFeelers({ slidesMm: null, stopsMm: null })).toThrow(FeelerReadingError);
    expect(() => clearanceFromFeelers({ slidesMm: 0.25, stopsMm: 0.2 })).toThrow(/must be thinner/);
    expect(() => clearanceFromFeelers({ slidesMm: 0.2, stopsMm: 0.2 })).toThrow(/must be thinner/);
    expect(() => clearanceFromFeelers({ slidesMm: -0.05, stopsMm: 0.1 })).toThrow(/above 0 mm/);
  });

  it('compares in micrometres: 0.1 + 0.2 slides, 0.3 stops is a valid reading', () => {
    // IEEE 754: 0.1 + 0.2 = 0.30000000000000004 > 0.3.
    expect(clearanceFromFeelers({ slidesMm: 0.1 + 0.2 - 0.05, stopsMm: 0.3 }).estimateMm).toBe(0.25);
  });

  it('always gives min = estimate < max for any valid pair of blades (property)', () => {
    const blade = fc.integer({ min: 1, max: 1000 });
    fc.assert(fc.property(blade, blade, (a, b) => {
      fc.pre(a !== b);
      const [s, t] = a < b ? [a, b] : [b, a];
      const r = clearanceFromFeelers({ slidesMm: s / 1000, stopsMm: t / 1000 });
      return r.minMm === r.estimateMm && r.maxMm !== null && r.estimateMm < r.maxMm;
    }));
  });
});

describe('blade series', () => {
  it('metric set: 0.02–0.10 mm by 0.01, then 0.15–1.00 mm by 0.05 (common practice, from memory)', () => {
    expect(METRIC_BLADES_MM.slice(0, 9)).toEqual([0.02, 0.03, 0.04, 0.05, 0.06, 0.07, 0.08, 0.09, 0.1]);
    expect(METRIC_BLADES_MM.slice(9, 12)).toEqual([0.15, 0.2, 0.25]);
    expect(METRIC_BLADES_MM.at(-1)).toBe(1);
    expect(METRIC_BLADES_MM).toHaveLength(27);
    expect(bladeSeries('metric')[12]).toEqual({ label: '0.30 mm', mm: 0.3 });
  });

  // 1 in = 25.4 mm exactly (international yard and pound agreement, 1959; NIST);
  // rounded values to 0.001 mm as listed in trade-references "Units".
  it.each([
    [0.0015, 0.038], [0.002, 0.051], [0.0025, 0.064], [0.003, 0.076], [0.004, 0.102],
    [0.005, 0.127], [0.006, 0.152], [0.008, 0.203], [0.01, 0.254], [0.012, 0.305],
  ])('inch blade %f in = %f mm', (inch, mm) => {
    const blade = bladeSeries('inch').find((b) => b.inch === inch);
    expect(blade?.mm).toBe(mm);
  });

  it('rounds 0.0025 in (63.5 µm exactly) up to 0.064 mm, not 0.063', () => {
    expect(inchToMicrons(0.0025)).toBe(64);
    expect(bladeSeries('inch')[2]).toEqual({ label: '0.0025 in', mm: 0.064, inch: 0.0025 });
  });

  it('every inch blade is within half a micrometre of inch × 25.4 (exact definition)', () => {
    for (const inch of INCH_BLADES_IN) {
      const mm = bladeSeries('inch').find((b) => b.inch === inch)!.mm;
      expect(Math.abs(mm - inch * 25.4)).toBeLessThanOrEqual(0.0005 + 1e-12);
    }
  });

  it('labels inch blades the way they are stamped', () => {
    const labels = bladeSeries('inch').map((b) => b.label);
    expect(labels.slice(0, 4)).toEqual(['0.0015 in', '0.002 in', '0.0025 in', '0.003 in']);
    expect(labels).toContain('0.010 in');
  });

  it('both series rise strictly', () => {
    for (const kind of ['metric', 'inch'] as const) {
      const um = bladeSeries(kind).map((b) => toMicrons(b.mm));
      expect(um.every((v, i) => i === 0 || v > um[i - 1])).toBe(true);
    }
  });
});

describe('nextBladeUp', () => {
  it('gives the next thicker blade of the series', () => {
    expect(nextBladeUp(bladeSeries('metric'), 0.1)).toBe(0.15);
    expect(nextBladeUp(METRIC_BLADES_MM, 0.07)).toBe(0.08);
    expect(nextBladeUp(bladeSeries('inch'), 0.064)).toBe(0.076);
  });

  it('starts at the thinnest blade when nothing slid in, and ends past the thickest', () => {
    expect(nextBladeUp(METRIC_BLADES_MM, null)).toBe(0.02);
    expect(nextBladeUp(METRIC_BLADES_MM, 1)).toBeNull();
  });

  it('is not fooled by float noise in the sliding blade', () => {
    expect(nextBladeUp(METRIC_BLADES_MM, 0.1 + 0.2)).toBe(0.35);
  });
});
