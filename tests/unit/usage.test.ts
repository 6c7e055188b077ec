import { describe, it, expect } from 'vitest';
import { differenceInCalendarDays } from 'date-fns';
import { usageEstimate, usageRate } from '../../shared/domain/usage';

// Usage is distance over elapsed days. Day counts are checked against date-fns
// differenceInCalendarDays (general-purpose reference library).
const days = (a: string, b: string) => differenceInCalendarDays(new Date(`${b}T00:00:00Z`), new Date(`${a}T00:00:00Z`));

describe('usageRate', () => {
  it('divides distance by days between the first and last reading in the window', () => {
    const readings = [
      { date: '2025-03-01', odometerKm: 10_000 },
      { date: '2025-03-11', odometerKm: 11_000 },
      { date: '2025-03-21', odometerKm: 12_500 },
    ];
    // 2,500 km over 20 days (date-fns agrees on the day count).
    expect(days('2025-03-01', '2025-03-21')).toBe(20);
    expect(usageRate(readings, '2025-03-25')).toBe(125);
  });

  it('takes first and last by date, whatever order the readings come in', () => {
    const readings = [
      { date: '2025-03-21', odometerKm: 12_500 },
      { date: '2025-03-01', odometerKm: 10_000 },
      { date: '2025-03-11', odometerKm: 11_000 },
    ];
    expect(usageRate(readings, '2025-03-21')).toBe(125);
  });

  it('counts the last windowDays days including today; exactly windowDays ago is outside', () => {
    // 31 Mar 2025 − 90 days = 31 Dec 2024 (date-fns).
    expect(days('2024-12-31', '2025-03-31')).toBe(90);
    const readings = [
      { date: '2024-12-31', odometerKm: 0 }, // outside the window
      { date: '2025-01-01', odometerKm: 1_000 },
      { date: '2025-03-31', odometerKm: 9_900 },
    ];
    const est = usageEstimate(readings, '2025-03-31');
    expect(est?.basis).toBe('window');
    expect(est?.from.date).toBe('2025-01-01');
    expect(est?.kmPerDay).toBeCloseTo(8_900 / 89, 12);
  });

  it('ignores readings dated after today', () => {
    const readings = [
      { date: '2025-03-01', odometerKm: 1_000 },
      { date: '2025-03-15', odometerKm: 1_700 },
      { date: '2025-04-01', odometerKm: 99_000 },
    ];
    expect(usageRate(readings, '2025-03-20')).toBe(50);
  });

  it('falls back to the whole history when the window holds readings under 7 days apart', () => {
    const readings = [
      { date: '2024-06-01', odometerKm: 5_000 },
      { date: '2025-03-20', odometerKm: 7_920 },
      { date: '2025-03-24', odometerKm: 8_000 },
    ];
    const est = usageEstimate(readings, '2025-03-25');
    expect(est?.basis).toBe('all');
    expect(days('2024-06-01', '2025-03-24')).toBe(296);
    expect(est?.kmPerDay).toBeCloseTo(3_000 / 296, 12);
  });

  it('falls back when the window holds a single reading', () => {
    const readings = [
      { date: '2024-10-01', odometerKm: 2_000 },
      { date: '2025-03-01', odometerKm: 2_302 },
    ];
    // 302 km over 151 days = 2 km a day (date-fns: 151 days).
    expect(days('2024-10-01', '2025-03-01')).toBe(151);
    expect(usageRate(readings, '2025-03-10')).toBe(2);
  });

  it('is null when nothing spans 7 days, or with fewer than two readings', () => {
    expect(usageRate([], '2025-03-10')).toBeNull();
    expect(usageRate([{ date: '2025-03-01', odometerKm: 5 }], '2025-03-10')).toBeNull();
    const close = [
      { date: '2025-03-01', odometerKm: 100 },
      { date: '2025-03-07', odometerKm: 400 },
    ];
    expect(usageRate(close, '2025-03-10')).toBeNull();
    // Exactly 7 days is enough.
    expect(usageRate([...close, { date: '2025-03-08', odometerKm: 450 }], '2025-03-10')).toBe(50);
  });

  it('honours a shorter window', () => {
    const readings = [
      { date: '2025-01-01', odometerKm: 0 },
      { date: '2025-03-01', odometerKm: 5_900 },
      { date: '2025-03-21', odometerKm: 6_900 },
    ];
    expect(usageRate(readings, '2025-03-21', 30)).toBe(50);
    expect(usageRate(readings, '2025-03-21', 90)).toBeCloseTo(6_900 / 79, 12);
  });

  it('never reports negative riding from a falling odometer', () => {
    const readings = [
      { date: '2025-03-01', odometerKm: 1_000 },
      { date: '2025-03-15', odometerKm: 900 },
    ];
    expect(usageRate(readings, '2025-03-15')).toBe(0);
  });

  it('rejects malformed dates and windows', () => {
    expect(() => usageRate([], '2025-3-1')).toThrow(/YYYY-MM-DD/);
    expect(() => usageRate([{ date: '2025-02-30', odometerKm: 1 }], '2025-03-01')).toThrow(/YYYY-MM-DD/);
    expect(() => usageRate([], '2025-03-01', 0)).toThrow(/window/);
  });
});
