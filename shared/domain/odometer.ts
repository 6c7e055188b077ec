import { assertIsoDate, compareIso, daysBetween, todayInZone, type IsoDate } from './dates';
import { fromKm, isOdometerUnit, toKm, type OdometerUnit } from './units';
import type { KmReading } from './usage';

/** What the odometer showed, as written down. `reset` marks a new or zeroed odometer; `value` is its start. */
export interface OdometerReading {
  date: IsoDate;
  value: number;
  unit: OdometerUnit;
  reset?: boolean;
}

/** One physical odometer's stretch of history, tied to the continuous km scale. */
export interface OdometerSegment {
  /** Continuous km at the moment this odometer took over. */
  startCumulativeKm: number;
  /** What this odometer showed then, in its own unit. */
  startValue: number;
  unit: OdometerUnit;
  startDate: IsoDate;
}

export interface CumulativeReading extends KmReading {
  /** Which odometer (0 = the first one recorded) showed this reading. */
  segment: number;
}

function checkReading(r: OdometerReading): void {
  assertIsoDate(r.date, 'reading date');
  if (!Number.isFinite(r.value) || r.value < 0) {
    throw new Error(`The odometer reading on ${r.date} must be a number of 0 or more, got ${r.value}`);
  }
  if (!isOdometerUnit(r.unit)) throw new Error(`Unknown odometer unit ${JSON.stringify(r.unit)}`);
}

function onSegment(r: OdometerReading, s: OdometerSegment): number {
  return s.startCumulativeKm + toKm(r.value, r.unit) - toKm(s.startValue, s.unit);
}

function walk(readings: readonly OdometerReading[]): { rows: CumulativeReading[]; segments: OdometerSegment[] } {
  const rows: CumulativeReading[] = [];
  const segments: OdometerSegment[] = [];
  for (const r of readings) {
    checkReading(r);
    const prev = rows[rows.length - 1];
    if (!prev || r.reset) {
      // The swap is taken to happen at this reading, so distance ridden after
      // the old odometer's last reading and before the swap is not counted.
      // The first reading ever anchors the scale at what that odometer shows.
      segments.push({
        startCumulativeKm: prev ? prev.odometerKm : toKm(r.value, r.unit),
        startValue: r.value,
        unit: r.unit,
        startDate: r.date,
      });
    }
    const segment = segments.length - 1;
    rows.push({ date: r.date, odometerKm: onSegment(r, segments[segment]), segment });
  }
  return { rows, segments };
}

/**
 * Turns raw readings, in the order they were recorded, into continuous km
 * that keep adding up across odometer replacements and resets.
 */
export function cumulativeKm(readings: readonly OdometerReading[]): CumulativeReading[] {
  return walk(readings).rows;
}

export function odometerSegments(readings: readonly OdometerReading[]): OdometerSegment[] {
  return walk(readings).segments;
}

/** The odometer fitted now, or null for a bike with no readings. */
export function currentOdometer(readings: readonly OdometerReading[]): OdometerSegment | null {
  const segments = odometerSegments(readings);
  return segments[segments.length - 1] ?? null;
}

/** What `segment`'s odometer shows (in its own unit) at a point on the continuous km scale. */
export function displayFromCumulative(cumulative: number, segment: OdometerSegment): number {
  return segment.startValue + fromKm(cumulative - segment.startCumulativeKm, segment.unit);
}

/** The continuous km for a value read off `segment`'s odometer. */
export function cumulativeFromDisplay(value: number, segment: OdometerSegment, unit = segment.unit): number {
  return segment.startCumulativeKm + toKm(value, unit) - toKm(segment.startValue, segment.unit);
}

export const DEFAULT_MAX_KM_PER_DAY = 1000;

export type ReadingCheck =
  | { kind: 'ok'; ok: true }
  | { kind: 'future_date'; ok: false; today: IsoDate }
  | { kind: 'before_last_date'; ok: false; lastDate: IsoDate }
  | { kind: 'lower_than_last'; ok: false; lastValue: number; lastUnit: OdometerUnit; lastDate: IsoDate }
  | { kind: 'big_jump'; ok: false; needsConfirmation: true; kmPerDay: number; km: number; days: number };

export interface ReadingCheckInput {
  /** The bike's latest recorded reading, if any. */
  last?: OdometerReading | null;
  next: OdometerReading;
  /** The site's calendar date; without it the UTC date is used. */
  today?: IsoDate;
  maxKmPerDay?: number;
}

/**
 * Checks a new reading against the last one before it is stored. A reset
 * reading (new odometer) may be lower than the last. A big jump is not an
 * error but asks the person to confirm; readings on the same day as the last
 * count as one day for the per-day pace.
 */
export function validateNextReading(input: ReadingCheckInput): ReadingCheck {
  const { last, next, maxKmPerDay = DEFAULT_MAX_KM_PER_DAY } = input;
  const today = input.today ?? todayInZone('UTC');
  assertIsoDate(today, 'date today');
  checkReading(next);
  if (last) checkReading(last);
  if (!(maxKmPerDay > 0)) throw new Error(`The most km per day must be above 0, got ${maxKmPerDay}`);

  if (compareIso(next.date, today) > 0) return { kind: 'future_date', ok: false, today };
  if (!last) return { kind: 'ok', ok: true };
  if (compareIso(next.date, last.date) < 0) return { kind: 'before_last_date', ok: false, lastDate: last.date };
  if (next.reset) return { kind: 'ok', ok: true };

  const lower = next.unit === last.unit ? next.value < last.value : toKm(next.value, next.unit) < toKm(last.value, last.unit);
  if (lower) return { kind: 'lower_than_last', ok: false, lastValue: last.value, lastUnit: last.unit, lastDate: last.date };

  const km = toKm(next.value, next.unit) - toKm(last.value, last.unit);
  const days = daysBetween(last.date, next.date);
  const kmPerDay = km / Math.max(1, days);
  if (kmPerDay > maxKmPerDay) return { kind: 'big_jump', ok: false, needsConfirmation: true, kmPerDay, km, days };
  return { kind: 'ok', ok: true };
}
