import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  fromKm, inchToMm, inchToMmRounded, kmToMiles, micrometresToMm, milesToKm, mmToInch, mmToMicrometres, roundTo, toKm,
} from '../../shared/domain/units';

describe('exact unit definitions', () => {
  // 1 in = 25.4 mm exactly: international yard and pound agreement (1959); NIST SP 811 appendix B.
  it('converts inches and millimetres by 25.4', () => {
    expect(inchToMm(1)).toBe(25.4);
    expect(mmToInch(25.4)).toBe(1);
    expect(inchToMm(10)).toBe(254);
  });

  // 1 mile = 1.609344 km exactly: same 1959 agreement; NIST SP 811 appendix B.
  it('converts miles and km by 1.609344', () => {
    expect(milesToKm(1)).toBe(1.609344);
    expect(kmToMiles(1.609344)).toBe(1);
    expect(milesToKm(1000)).toBeCloseTo(1609.344, 9);
    expect(toKm(100, 'mi')).toBeCloseTo(160.9344, 9);
    expect(toKm(100, 'km')).toBe(100);
    expect(fromKm(160.9344, 'mi')).toBeCloseTo(100, 9);
    expect(fromKm(42, 'km')).toBe(42);
  });
});

describe('inch feeler blades in millimetres', () => {
  // Exact mm = in × 25.4 (1959 agreement); the rounded labels are the blade values listed in
  // trade-references.md, including 0.0025 in → 0.064 mm (half up, not 0.063 by truncation).
  const blades: [inch: number, exact: number, rounded: number][] = [
    [0.0015, 0.0381, 0.038],
    [0.002, 0.0508, 0.051],
    [0.0025, 0.0635, 0.064],
    [0.003, 0.0762, 0.076],
    [0.004, 0.1016, 0.102],
    [0.005, 0.127, 0.127],
    [0.006, 0.1524, 0.152],
    [0.008, 0.2032, 0.203],
    [0.01, 0.254, 0.254],
    [0.012, 0.3048, 0.305],
  ];
  it.each(blades)('%f in is %f mm, labelled %f mm', (inch, exact, rounded) => {
    expect(inchToMm(inch)).toBeCloseTo(exact, 12);
    expect(inchToMmRounded(inch)).toBe(rounded);
  });

  it('rounds the exact decimal, not the float just below it', () => {
    // 0.0075 in × 25.4 = 0.1905 mm exactly (1959 definition), labelled 0.191 rounding half up;
    // IEEE 754 binary64 holds the product as 0.19049999999999997, so naive rounding gives 0.19.
    expect(Math.round(0.0075 * 25.4 * 1000) / 1000).toBe(0.19);
    expect(inchToMmRounded(0.0075)).toBe(0.191);
    // The classic JavaScript case: 1.005 × 100 is 100.49999999999999 in binary64.
    expect(roundTo(1.005, 2)).toBe(1.01);
  });

  it('rounds half away from zero and keeps whole micrometres exact', () => {
    expect(roundTo(-0.0635, 3)).toBe(-0.064);
    expect(roundTo(2.5, 0)).toBe(3);
    expect(roundTo(0.0004, 3)).toBe(0);
    // 0.30 − 0.22 in float is 0.07999999999999999 (trade-references.md); in micrometres it is 80.
    expect(mmToMicrometres(0.3) - mmToMicrometres(0.22)).toBe(80);
    expect(mmToMicrometres(inchToMm(0.0025))).toBe(64);
    expect(micrometresToMm(155)).toBe(0.155);
  });
});

describe('round trips (property)', () => {
  // Both factors are exact definitions (1959 agreement), so a round trip may lose only float rounding.
  // From 1 mm up: below that, subnormal floats make relative error meaningless.
  const distance = fc.oneof(fc.constant(0), fc.double({ min: 1e-6, max: 2_000_000, noNaN: true }));
  it('km → miles → km returns the same value within 1e-9 relative', () => {
    fc.assert(
      fc.property(distance, (km) => {
        expect(Math.abs(milesToKm(kmToMiles(km)) - km)).toBeLessThanOrEqual(1e-9 * km);
      }),
    );
  });

  it('miles → km → miles and mm → in → mm do the same', () => {
    fc.assert(
      fc.property(distance, (x) => {
        const tol = 1e-9 * x;
        expect(Math.abs(kmToMiles(milesToKm(x)) - x)).toBeLessThanOrEqual(tol);
        expect(Math.abs(inchToMm(mmToInch(x)) - x)).toBeLessThanOrEqual(tol);
        expect(Math.abs(fromKm(toKm(x, 'mi'), 'mi') - x)).toBeLessThanOrEqual(tol);
      }),
    );
  });
});
