import { addDaysIso, assertIsoDate, compareIso, daysBetween, type IsoDate } from './dates';

/** A check-in reading on the continuous (reset-free) km scale. */
export interface KmReading {
  date: IsoDate;
  odometerKm: number;
}

export interface UsageEstimate {
  kmPerDay: number;
  from: KmReading;
  to: KmReading;
  /** 'window': recent readings; 'all': the whole history, used when recent ones are too close together. */
  basis: 'window' | 'all';
}

export const DEFAULT_USAGE_WINDOW_DAYS = 90;
/** Readings closer together than this say little about a bike's pace. */
export const MIN_USAGE_SPAN_DAYS = 7;

function rateBetween(sorted: KmReading[], basis: UsageEstimate['basis']): UsageEstimate | null {
  if (sorted.length < 2) return null;
  const from = sorted[0];
  const to = sorted[sorted.length - 1];
  const days = daysBetween(from.date, to.date);
  if (days < MIN_USAGE_SPAN_DAYS) return null;
  // A falling odometer on the continuous scale is bad data, not negative riding.
  const kmPerDay = Math.max(0, (to.odometerKm - from.odometerKm) / days);
  return { kmPerDay, from, to, basis };
}

/**
 * How far a bike goes per day, from its check-ins. The window is the
 * `windowDays` calendar days ending today, today included: with 90 days on
 * 31 March 2025, readings from 1 January on count and one from 31 December
 * (exactly 90 days back) does not.
 * When the window's first and last readings are under 7 days apart, the whole
 * history up to today is used instead. Readings dated after today are ignored.
 */
export function usageEstimate(
  readings: readonly KmReading[],
  today: IsoDate,
  windowDays = DEFAULT_USAGE_WINDOW_DAYS,
): UsageEstimate | null {
  assertIsoDate(today, 'usage date');
  if (!Number.isInteger(windowDays) || windowDays < 1) {
    throw new Error(`The usage window must be a whole number of days, at least 1, got ${windowDays}`);
  }
  for (const r of readings) {
    assertIsoDate(r.date, 'reading date');
    if (!Number.isFinite(r.odometerKm)) throw new Error(`Reading on ${r.date} has no valid odometer value`);
  }
  // Same-day readings order by distance, so "first" and "last" take the day's extremes.
  const upToToday = readings
    .filter((r) => compareIso(r.date, today) <= 0)
    .sort((a, b) => compareIso(a.date, b.date) || a.odometerKm - b.odometerKm);
  const windowStart = addDaysIso(today, -windowDays);
  const recent = upToToday.filter((r) => compareIso(r.date, windowStart) > 0);
  return rateBetween(recent, 'window') ?? rateBetween(upToToday, 'all');
}

/** Km per day, or null when the readings cannot tell. */
export function usageRate(
  readings: readonly KmReading[],
  today: IsoDate,
  windowDays = DEFAULT_USAGE_WINDOW_DAYS,
): number | null {
  return usageEstimate(readings, today, windowDays)?.kmPerDay ?? null;
}
