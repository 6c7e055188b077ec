import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';

// Calendar dates travel as 'YYYY-MM-DD' strings. All arithmetic runs on UTC
// midnights, so the server's own time zone and daylight saving can never move
// a date by a day.

export type IsoDate = string;

const ISO_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const MS_PER_DAY = 86_400_000;

interface Ymd {
  readonly year: number;
  readonly month: number; // 1–12
  readonly day: number;
}

const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** Days in a month of the proleptic Gregorian calendar (the one JavaScript's Date uses). */
export function daysInMonth(year: number, month: number): number {
  if (Number.isInteger(year) && Number.isInteger(month) && month >= 1 && month <= 12) {
    const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
    return month === 2 && leap ? 29 : MONTH_DAYS[month - 1];
  }
  return new Date(utcMs(year, month + 1, 0)).getUTCDate();
}

function utcMs(year: number, month: number, day: number): number {
  if (year >= 100) return Date.UTC(year, month - 1, day);
  // Date.UTC maps years 0–99 to 1900–1999; setUTCFullYear does not.
  const d = new Date(Date.UTC(2000, 0, 1));
  d.setUTCFullYear(year, month - 1, day);
  return d.getTime();
}

// A fleet-wide computation parses the same few hundred dates (today, service dates) over and over.
const parsed = new Map<string, Ymd | null>();
const PARSED_MAX = 4096;

function parts(date: string): Ymd | null {
  let p = parsed.get(date);
  if (p !== undefined) return p;
  p = parse(date);
  if (parsed.size >= PARSED_MAX) parsed.clear();
  parsed.set(date, p);
  return p;
}

function parse(date: string): Ymd | null {
  const m = ISO_DATE.exec(date);
  if (!m) return null;
  const ymd = { year: Number(m[1]), month: Number(m[2]), day: Number(m[3]) };
  if (ymd.month < 1 || ymd.month > 12) return null;
  if (ymd.day < 1 || ymd.day > daysInMonth(ymd.year, ymd.month)) return null;
  return ymd;
}

function pad(n: number, width: number): string {
  return String(n).padStart(width, '0');
}

function fromUtcMs(ms: number): IsoDate {
  const d = new Date(ms);
  const year = d.getUTCFullYear();
  if (year < 0 || year > 9999) throw new Error('Date is outside the years 0000–9999');
  return `${pad(year, 4)}-${pad(d.getUTCMonth() + 1, 2)}-${pad(d.getUTCDate(), 2)}`;
}

export function isIsoDate(value: unknown): value is IsoDate {
  return typeof value === 'string' && parts(value) !== null;
}

/** Throws unless `value` is a real calendar date written as YYYY-MM-DD. */
export function assertIsoDate(value: unknown, label = 'date'): asserts value is IsoDate {
  if (!isIsoDate(value)) {
    throw new Error(`The ${label} must be a calendar date written as YYYY-MM-DD, got ${JSON.stringify(value)}`);
  }
}

function ymd(date: IsoDate, label?: string): Ymd {
  const p = typeof date === 'string' ? parts(date) : null;
  if (!p) assertIsoDate(date, label);
  return p as Ymd;
}

function assertWhole(n: number, what: string): void {
  if (!Number.isInteger(n)) throw new Error(`${what} must be a whole number, got ${n}`);
}

export function toUtcDate(date: IsoDate): Date {
  const { year, month, day } = ymd(date);
  return new Date(utcMs(year, month, day));
}

export function fromUtcDate(d: Date): IsoDate {
  if (Number.isNaN(d.getTime())) throw new Error('Invalid Date');
  return fromUtcMs(Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate()));
}

export function addDaysIso(date: IsoDate, n: number): IsoDate {
  assertWhole(n, 'Days to add');
  const { year, month, day } = ymd(date);
  return fromUtcMs(utcMs(year, month, day + n));
}

/**
 * Adds calendar months, keeping the day of month but clamping to the end of a
 * shorter month: 31 Aug + 6 months = 28 Feb (29 in a leap year). Each call
 * steps from its own anchor, so +12 from 31 Aug is 31 Aug, not the 28 Aug two
 * chained +6 steps would give.
 */
export function addMonthsIso(date: IsoDate, n: number): IsoDate {
  assertWhole(n, 'Months to add');
  const { year, month, day } = ymd(date);
  const index = year * 12 + (month - 1) + n;
  const y = Math.floor(index / 12);
  const m = index - y * 12 + 1;
  return fromUtcMs(utcMs(y, m, Math.min(day, daysInMonth(y, m))));
}

/** b − a in whole days: positive when b is later. */
export function daysBetween(a: IsoDate, b: IsoDate): number {
  return Math.round((toUtcDate(b).getTime() - toUtcDate(a).getTime()) / MS_PER_DAY);
}

export function compareIso(a: IsoDate, b: IsoDate): -1 | 0 | 1 {
  assertIsoDate(a);
  assertIsoDate(b);
  // Fixed-width YYYY-MM-DD sorts the same as the dates it names.
  return a < b ? -1 : a > b ? 1 : 0;
}

export function minIso(a: IsoDate, b: IsoDate): IsoDate {
  return compareIso(a, b) <= 0 ? a : b;
}

export function maxIso(a: IsoDate, b: IsoDate): IsoDate {
  return compareIso(a, b) >= 0 ? a : b;
}

/** The calendar date a wall clock in `timeZone` shows at `instant`. */
export function todayInZone(timeZone: string, instant: Date = new Date()): IsoDate {
  const zoned = new TZDate(instant, timeZone);
  if (Number.isNaN(zoned.getTime())) {
    throw new Error(`Unknown time zone "${timeZone}" or invalid instant`);
  }
  return format(zoned, 'yyyy-MM-dd');
}

/** The instant (epoch ms) a calendar day begins on the wall clock of `timeZone` (midnight, or the first minute after a gap). */
export function startOfDayInZone(date: IsoDate, timeZone: string): number {
  const p = parts(date);
  if (!p) throw new Error(`Not a calendar date: "${date}"`);
  return new TZDate(p.year, p.month - 1, p.day, 0, 0, 0, timeZone).getTime();
}

/** An instant as the wall clock of `timeZone` shows it, in a date-fns pattern (e.g. 'EEE d MMM HH:mm'). */
export function formatInZone(instant: number | Date, timeZone: string, pattern: string): string {
  return format(new TZDate(typeof instant === 'number' ? instant : instant.getTime(), timeZone), pattern);
}
