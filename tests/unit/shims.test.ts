import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { parseShimMarking, recommendShim, shimSizes, ShimInputError } from '../../shared/domain/shims';

// Published series: 1.20–2.40 mm by 0.05 (25 sizes); 2.50–3.50 by 0.05 (21 sizes).
const SERIES = shimSizes({ minMm: 1.2, maxMm: 3.5, stepMm: 0.05 });

describe('parseShimMarking', () => {
  // Factory manuals: the etched number is the thickness in hundredths of a mm, "155" = 1.55 mm.
  it.each([['255', 2.55], ['155', 1.55], [' 120 ', 1.2], ['400', 4], ['100', 1]])('reads marking %s as %f mm', (m, mm) => {
    expect(parseShimMarking(m)).toBe(mm);
  });

  it.each([['2.55', 2.55], ['2,55', 2.55], ['2.608', 2.608], ['3.5', 3.5], ['1,225', 1.225]])('reads thickness %s as %f mm', (m, mm) => {
    expect(parseShimMarking(m)).toBe(mm);
  });

  it('asks for the full marking when only the last two digits are given', () => {
    expect(() => parseShimMarking('55')).toThrow(/all three digits/);
  });

  it.each(['', '   ', 'abc', '2.55mm', '25a', '099', '401', '0.95', '4.05', '2550', '-2.55', '2.', '2.5555'])(
    'refuses %j and says what is expected',
    (m) => {
      expect(() => parseShimMarking(m)).toThrow(ShimInputError);
      expect(() => parseShimMarking(m)).toThrow(/e\.g\. "255" for 2\.55 mm/);
    },
  );
});

describe('shimSizes', () => {
  it('1.20–3.50 by 0.05 gives exactly 47 sizes with clean decimals', () => {
    expect(SERIES).toHaveLength(47);
    expect(SERIES[0]).toBe(1.2);
    expect(SERIES.at(-1)).toBe(3.5);
    expect(SERIES).toContain(2.95);
  });

  // Published series sizes (trade-references: factory manuals).
  it('matches the published counts: 1.20–2.40/0.05 → 25, 1.200–2.900/0.025 → 69, 2.50–3.50/0.05 → 21', () => {
    expect(shimSizes({ minMm: 1.2, maxMm: 2.4, stepMm: 0.05 })).toHaveLength(25);
    expect(shimSizes({ minMm: 1.2, maxMm: 2.9, stepMm: 0.025 })).toHaveLength(69);
    expect(shimSizes({ minMm: 2.5, maxMm: 3.5, stepMm: 0.05 })).toHaveLength(21);
  });

  it('refuses a zero step and an inverted range', () => {
    expect(() => shimSizes({ minMm: 1.2, maxMm: 2.4, stepMm: 0 })).toThrow(ShimInputError);
    expect(() => shimSizes({ minMm: 2.4, maxMm: 1.2, stepMm: 0.05 })).toThrow(ShimInputError);
  });
});

describe('recommendShim', () => {
  const spec = { specMinMm: 0.15, specMaxMm: 0.22, sizesMm: SERIES };

  // Worked examples from published manuals (trade-references.md); new shim =
  // old shim + measured − target (N = T + (A − V)), target = middle of spec.
  it('0.15–0.22, old 1.55, measured 0.25 → 1.60, expected 0.20', () => {
    const r = recommendShim({ ...spec, currentShimMm: 1.55, measuredClearanceMm: 0.25 });
    expect(r).toMatchObject({ change: 'replace', shimMm: 1.6, expectedClearanceMm: 0.2, inSpec: false, exactShimMm: 1.615, targetMm: 0.185 });
  });

  it('0.15–0.22, old 1.55, measured 0.30 → 1.65, expected 0.20', () => {
    const r = recommendShim({ ...spec, currentShimMm: 1.55, measuredClearanceMm: 0.3 });
    expect(r).toMatchObject({ change: 'replace', shimMm: 1.65, expectedClearanceMm: 0.2 });
  });

  it('0.15–0.22, old 1.55, measured 0.29: mid-target gives 1.65 (0.19), not the 1.60 (0.24, out of spec) of a top-of-range table', () => {
    const r = recommendShim({ ...spec, currentShimMm: 1.55, measuredClearanceMm: 0.29 });
    expect(r).toMatchObject({ shimMm: 1.65, expectedClearanceMm: 0.19 });
  });

  // One factory table: old 2.95, measured 0.47 → 3.15 (expected 0.27 mm). With a
  // 0.20–0.30 spec (mid 0.25): 3.15 → 0.27 (0.02 off), 3.20 → 0.22 (0.03 off).
  it('old 2.95, measured 0.47 → 3.15, expected 0.27 (spec 0.20–0.30, and with target 0.27)', () => {
    const q = { currentShimMm: 2.95, measuredClearanceMm: 0.47, specMinMm: 0.2, specMaxMm: 0.3, sizesMm: SERIES };
    expect(recommendShim(q)).toMatchObject({ shimMm: 3.15, expectedClearanceMm: 0.27 });
    expect(recommendShim({ ...q, targetMm: 0.27 })).toMatchObject({ shimMm: 3.15, expectedClearanceMm: 0.27, exactShimMm: 3.15 });
  });

  // Common practice of shim-under-bucket adjustment: between two sizes, lean loose.
  it('on an exact tie takes the thinner shim (looser valve)', () => {
    // 0.30 − 0.22 style values: in floating point 1.55 + 0.325 − 1.65 and 1.70 sit at
    // unequal distances from 0.20, but in micrometres both are 25 µm off.
    const r = recommendShim({ currentShimMm: 1.55, measuredClearanceMm: 0.325, specMinMm: 0.15, specMaxMm: 0.25, sizesMm: SERIES });
    expect(r).toMatchObject({ shimMm: 1.65, expectedClearanceMm: 0.225 });
    const floatGap = Math.abs(Math.abs(0.325 + 1.55 - 1.65 - 0.2) - Math.abs(0.325 + 1.55 - 1.7 - 0.2));
    expect(floatGap).toBeGreaterThan(0); // why the arithmetic is done in whole micrometres
  });

  it('leaves a valve that is in spec alone, but still names the ideal size', () => {
    // 0.22 is the top of 0.15–0.22 (bounds inclusive); 1.60 would give 0.17, nearer 0.185.
    const r = recommendShim({ ...spec, currentShimMm: 1.55, measuredClearanceMm: 0.22 });
    expect(r).toMatchObject({ change: 'keep', inSpec: true, shimMm: 1.55, expectedClearanceMm: 0.22, bestShimMm: 1.6, bestExpectedClearanceMm: 0.17 });
  });

  it('says none-fits when the needed shim is outside the series, and still gives the exact size', () => {
    const r = recommendShim({ ...spec, currentShimMm: 1.25, measuredClearanceMm: 0.05 });
    expect(r).toMatchObject({ change: 'none-fits', shimMm: null, expectedClearanceMm: null, bestShimMm: null, exactShimMm: 1.115 });
  });

  it('refuses a target outside the spec', () => {
    expect(() => recommendShim({ ...spec, currentShimMm: 1.55, measuredClearanceMm: 0.3, targetMm: 0.3 })).toThrow(ShimInputError);
  });

  it('a recommended shim always gives an in-spec expected clearance, nearest the target (property)', () => {
    const um = (min: number, max: number) => fc.integer({ min, max });
    fc.assert(fc.property(um(1200, 3500), um(0, 600), um(20, 400), um(10, 200), (cur, meas, min, width) => {
      const q = { currentShimMm: cur / 1000, measuredClearanceMm: meas / 1000, specMinMm: min / 1000, specMaxMm: (min + width) / 1000, sizesMm: SERIES };
      const r = recommendShim(q);
      if (r.change === 'none-fits') {
        // No size of the series fits: check by brute force in micrometres.
        return SERIES.every((s) => { const e = meas + cur - Math.round(s * 1000); return e < min || e > min + width; });
      }
      const e = Math.round(r.expectedClearanceMm! * 1000);
      if (e < min || e > min + width) return false;
      if (e !== meas + cur - Math.round(r.shimMm! * 1000)) return false;
      if (r.change === 'keep') return r.inSpec && r.shimMm === q.currentShimMm;
      const target = min + width / 2;
      return SERIES.every((s) => {
        const es = meas + cur - Math.round(s * 1000);
        const [ds, d] = [Math.abs(es - target), Math.abs(e - target)];
        // Nothing nearer; at an equal distance nothing thinner (the tie rule).
        return es < min || es > min + width || ds > d || (ds === d && s >= r.shimMm!);
      });
    }));
  });
});
