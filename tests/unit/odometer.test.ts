import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
  cumulativeFromDisplay, cumulativeKm, currentOdometer, displayFromCumulative, odometerSegments, validateNextReading,
  type OdometerReading,
} from '../../shared/domain/odometer';

// A replaced odometer does not undo the distance the bike has covered: service
// intervals keep counting across the swap (common practice: workshops record
// the old and new readings so history stays continuous).
const addDays = (n: number) => new Date(Date.UTC(2024, 0, 1 + n)).toISOString().slice(0, 10);

describe('cumulativeKm across an odometer reset', () => {
  const history: OdometerReading[] = [
    { date: '2025-01-05', value: 18_000, unit: 'km' },
    { date: '2025-02-05', value: 20_400, unit: 'km' },
    { date: '2025-02-06', value: 0, unit: 'km', reset: true },
    { date: '2025-03-06', value: 2_500, unit: 'km' },
  ];

  it('keeps adding distance after the reset', () => {
    expect(cumulativeKm(history).map((r) => r.odometerKm)).toEqual([18_000, 20_400, 20_400, 22_900]);
    expect(cumulativeKm(history).map((r) => r.segment)).toEqual([0, 0, 1, 1]);
  });

  it('handles a replacement odometer that does not start at zero', () => {
    const swapped: OdometerReading[] = [
      { date: '2025-01-01', value: 31_000, unit: 'km' },
      { date: '2025-01-20', value: 12, unit: 'km', reset: true },
      { date: '2025-02-01', value: 612, unit: 'km' },
      { date: '2025-02-10', value: 5, unit: 'km', reset: true },
      { date: '2025-02-20', value: 105, unit: 'km' },
    ];
    // 31,000 + (612 − 12) = 31,600; then + (105 − 5) = 31,700.
    expect(cumulativeKm(swapped).map((r) => r.odometerKm)).toEqual([31_000, 31_000, 31_600, 31_600, 31_700]);
  });

  it('converts a miles odometer to km with 1 mile = 1.609344 km (1959 agreement)', () => {
    const miles: OdometerReading[] = [
      { date: '2025-01-01', value: 1_000, unit: 'mi' },
      { date: '2025-02-01', value: 1_500, unit: 'mi' },
    ];
    const km = cumulativeKm(miles).map((r) => r.odometerKm);
    expect(km[0]).toBeCloseTo(1_609.344, 9);
    expect(km[1]).toBeCloseTo(2_414.016, 9);
  });

  it('handles a km odometer replaced by a miles one', () => {
    const mixed: OdometerReading[] = [
      { date: '2025-01-01', value: 10_000, unit: 'km' },
      { date: '2025-01-02', value: 100, unit: 'mi', reset: true },
      { date: '2025-02-01', value: 200, unit: 'mi' },
    ];
    // 10,000 km + 100 mi × 1.609344 (1959 agreement).
    expect(cumulativeKm(mixed)[2].odometerKm).toBeCloseTo(10_160.9344, 9);
  });

  it('converts a cumulative km back to what the fitted odometer shows', () => {
    const seg = currentOdometer(history);
    expect(seg).toEqual({ startCumulativeKm: 20_400, startValue: 0, unit: 'km', startDate: '2025-02-06' });
    // An oil change due at 25,400 km on the continuous scale shows as 5,000 on the new odometer.
    expect(displayFromCumulative(25_400, seg!)).toBe(5_000);
    expect(cumulativeFromDisplay(5_000, seg!)).toBe(25_400);
  });

  it('shows "due at" in miles on a miles odometer', () => {
    const seg = currentOdometer([
      { date: '2025-01-01', value: 20_000, unit: 'km' },
      { date: '2025-01-02', value: 0, unit: 'mi', reset: true },
    ])!;
    // 20,000 km + 5,000 km = 5,000 / 1.609344 mi ≈ 3,106.856 mi on the new odometer (1959 agreement).
    expect(displayFromCumulative(25_000, seg)).toBeCloseTo(3_106.855_961, 5);
    expect(cumulativeFromDisplay(displayFromCumulative(25_000, seg), seg)).toBeCloseTo(25_000, 9);
  });

  it('lists one segment per odometer and none for an empty history', () => {
    expect(odometerSegments(history)).toHaveLength(2);
    expect(currentOdometer([])).toBeNull();
    expect(cumulativeKm([])).toEqual([]);
  });

  it('adds up every odometer’s own distance and reads back what the last one shows (property)', () => {
    // Continuity across swaps (common practice); the total is plain addition of each odometer's travel.
    const odometer = fc.record({
      start: fc.integer({ min: 0, max: 50_000 }),
      steps: fc.array(fc.integer({ min: 0, max: 3_000 }), { maxLength: 8 }),
    });
    fc.assert(
      fc.property(fc.array(odometer, { minLength: 1, maxLength: 5 }), (odometers) => {
        const rows: OdometerReading[] = [];
        let day = 0;
        odometers.forEach(({ start, steps }, i) => {
          let value = start;
          rows.push({ date: addDays(day++), value, unit: 'km', reset: i > 0 });
          for (const step of steps) rows.push({ date: addDays(day++), value: (value += step), unit: 'km' });
        });
        const km = cumulativeKm(rows).map((r) => r.odometerKm);
        const travelled = odometers.flatMap((o) => o.steps).reduce((a, b) => a + b, 0);
        expect(km[km.length - 1]).toBe(odometers[0].start + travelled);
        km.slice(1).forEach((v, i) => expect(v).toBeGreaterThanOrEqual(km[i]));
        expect(displayFromCumulative(km[km.length - 1], currentOdometer(rows)!)).toBe(rows[rows.length - 1].value);
      }),
    );
  });

  it('rejects malformed readings', () => {
    expect(() => cumulativeKm([{ date: '2025-13-01', value: 1, unit: 'km' }])).toThrow(/YYYY-MM-DD/);
    expect(() => cumulativeKm([{ date: '2025-01-01', value: -1, unit: 'km' }])).toThrow(/0 or more/);
    expect(() => cumulativeKm([{ date: '2025-01-01', value: Number.NaN, unit: 'km' }])).toThrow();
  });
});

describe('validateNextReading', () => {
  const last: OdometerReading = { date: '2025-03-01', value: 12_000, unit: 'km' };
  const today = '2025-03-10';

  it('accepts a normal reading, an unchanged one and the first one', () => {
    expect(validateNextReading({ last, next: { date: today, value: 12_800, unit: 'km' }, today })).toEqual({ kind: 'ok', ok: true });
    expect(validateNextReading({ last, next: { date: today, value: 12_000, unit: 'km' }, today }).kind).toBe('ok');
    expect(validateNextReading({ last: null, next: { date: today, value: 5, unit: 'km' }, today }).kind).toBe('ok');
  });

  it('refuses a reading lower than the last, naming the last value', () => {
    expect(validateNextReading({ last, next: { date: today, value: 11_999, unit: 'km' }, today })).toEqual({
      kind: 'lower_than_last', ok: false, lastValue: 12_000, lastUnit: 'km', lastDate: '2025-03-01',
    });
  });

  it('accepts a lower reading when it marks a new odometer', () => {
    expect(validateNextReading({ last, next: { date: today, value: 0, unit: 'km', reset: true }, today }).kind).toBe('ok');
  });

  it('refuses a date after today and a date before the last reading', () => {
    expect(validateNextReading({ last, next: { date: '2025-03-11', value: 12_100, unit: 'km' }, today })).toEqual({
      kind: 'future_date', ok: false, today,
    });
    expect(validateNextReading({ last, next: { date: '2025-02-28', value: 12_100, unit: 'km' }, today }).kind).toBe('before_last_date');
  });

  it('asks to confirm a jump above the daily limit', () => {
    // 9,000 km in 9 days is 1,000 a day: at the limit, fine. 9,001 is over it.
    expect(validateNextReading({ last, next: { date: today, value: 21_000, unit: 'km' }, today }).kind).toBe('ok');
    expect(validateNextReading({ last, next: { date: today, value: 21_001, unit: 'km' }, today })).toMatchObject({
      kind: 'big_jump', needsConfirmation: true, km: 9_001, days: 9,
    });
    expect(validateNextReading({ last, next: { date: today, value: 13_000, unit: 'km' }, today, maxKmPerDay: 100 })).toMatchObject({
      kind: 'big_jump', kmPerDay: 1_000 / 9,
    });
  });

  it('counts a same-day reading as one day of riding', () => {
    const r = validateNextReading({ last, next: { date: '2025-03-01', value: 13_500, unit: 'km' }, today });
    expect(r).toMatchObject({ kind: 'big_jump', kmPerDay: 1_500, days: 0 });
  });

  it('compares across units in km (1 mile = 1.609344 km, 1959 agreement)', () => {
    const lastMi: OdometerReading = { date: '2025-03-01', value: 1_000, unit: 'mi' };
    expect(validateNextReading({ last: lastMi, next: { date: today, value: 1_609, unit: 'km' }, today }).kind).toBe('lower_than_last');
    expect(validateNextReading({ last: lastMi, next: { date: today, value: 1_610, unit: 'km' }, today }).kind).toBe('ok');
  });

  it('throws on malformed input', () => {
    expect(() => validateNextReading({ last, next: { date: '10/03/2025', value: 1, unit: 'km' }, today })).toThrow(/YYYY-MM-DD/);
    expect(() => validateNextReading({ last, next: { date: today, value: 1, unit: 'km' }, today, maxKmPerDay: 0 })).toThrow();
  });
});
