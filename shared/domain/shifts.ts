import { TZDate } from '@date-fns/tz';
import type { Interval } from './plan-types';
import { addDaysIso, startOfDayInZone, todayInZone, toUtcDate } from './dates';
import { RRule, rrulestr } from './rrule';

// Workshop capacity as working time. Opening hours and working patterns are written on the site's
// wall clock ("08:00–16:30 every weekday"); the planner needs instants. Days are walked as calendar
// dates ('YYYY-MM-DD') and each local time is turned into an instant with @date-fns/tz, so a shift on
// a daylight-saving day still starts at 08:00 local and lasts what the clock says.

export interface SiteHoursRow {
  /** ISO weekday, 1 = Monday … 7 = Sunday. */
  weekday: number;
  opensAt: string;
  closesAt: string;
}

export interface PatternRow {
  /** RFC 5545 RRULE without DTSTART; it counts from `startsOn`. */
  rrule: string;
  startsOn: string;
  endsOn: string | null;
  startTime: string;
  endTime: string;
}

export interface TimeOffRow {
  firstDay: string;
  lastDay: string;
}

export const WEEKDAYS = ['Monday', 'Tuesday', 'Wednesday', 'Thursday', 'Friday', 'Saturday', 'Sunday'] as const;
export const RULE_DAYS = ['MO', 'TU', 'WE', 'TH', 'FR', 'SA', 'SU'] as const;
const TIME = /^([01]\d|2[0-3]):([0-5]\d)$/;
const DAY_MS = 86_400_000;
/** A rule that yields more days than this over the expansion window is cut short (a runaway rule). */
const MAX_DAYS = 5000;

/** Minutes after midnight of "HH:MM", or null when it is not a 24-hour time. */
export function minutesOf(time: string): number | null {
  const m = TIME.exec(time);
  return m ? Number(m[1]) * 60 + Number(m[2]) : null;
}

/** ISO weekday (1 = Monday … 7 = Sunday) of a calendar date. */
export function isoWeekday(day: string): number {
  const d = toUtcDate(day).getUTCDay();
  return d === 0 ? 7 : d;
}

/** The instant the wall clock of `timeZone` shows `time` ("HH:MM") on `day`. */
export function localInstant(day: string, time: string, timeZone: string): number {
  const [y, mo, d] = day.split('-').map(Number);
  const [h, mi] = time.split(':').map(Number);
  return new TZDate(y, mo - 1, d, h, mi, 0, timeZone).getTime();
}

/** The site's calendar days that overlap [from, to), in order. */
export function daysCovering(timeZone: string, from: number, to: number): string[] {
  const out: string[] = [];
  if (!(to > from)) return out;
  for (let day = todayInZone(timeZone, new Date(from)); startOfDayInZone(day, timeZone) < to; day = addDaysIso(day, 1)) out.push(day);
  return out;
}

const clip = (i: Interval, from: number, to: number): Interval | null => {
  const start = Math.max(i.start, from);
  const end = Math.min(i.end, to);
  return end > start ? { start, end } : null;
};

/** Sorted, with overlapping or touching intervals joined. */
export function mergeIntervals(list: readonly Interval[]): Interval[] {
  const sorted = list.filter((i) => i.end > i.start).sort((a, b) => a.start - b.start || a.end - b.end);
  const out: Interval[] = [];
  for (const i of sorted) {
    const last = out[out.length - 1];
    if (last && i.start <= last.end) last.end = Math.max(last.end, i.end);
    else out.push({ start: i.start, end: i.end });
  }
  return out;
}

/** The parts of `a` that also lie in `b` (both any order; the result sorted and merged). */
export function intersectIntervals(a: readonly Interval[], b: readonly Interval[]): Interval[] {
  const x = mergeIntervals(a);
  const y = mergeIntervals(b);
  const out: Interval[] = [];
  let i = 0;
  let j = 0;
  while (i < x.length && j < y.length) {
    const start = Math.max(x[i].start, y[j].start);
    const end = Math.min(x[i].end, y[j].end);
    if (end > start) out.push({ start, end });
    if (x[i].end < y[j].end) i++;
    else j++;
  }
  return mergeIntervals(out);
}

/**
 * The workshop's opening hours inside [from, to): one interval per open day, local opening and closing
 * times turned into instants in the site's zone. A weekday without a row is closed; a row whose closing
 * time is not after its opening time opens nothing.
 */
export function siteOpenIntervals(hours: readonly SiteHoursRow[], timeZone: string, from: number, to: number): Interval[] {
  const byDay = new Map(hours.map((h) => [h.weekday, h]));
  const out: Interval[] = [];
  for (const day of daysCovering(timeZone, from, to)) {
    const h = byDay.get(isoWeekday(day));
    if (!h) continue;
    const o = minutesOf(h.opensAt);
    const c = minutesOf(h.closesAt);
    if (o === null || c === null || c <= o) continue;
    const i = clip({ start: localInstant(day, h.opensAt, timeZone), end: localInstant(day, h.closesAt, timeZone) }, from, to);
    if (i) out.push(i);
  }
  return out;
}

// ── Repeat rules ─────────────────────────────────────────────────────────────
const WEEKDAY_PART = '(?:[+-]?\\d{1,2})?(?:MO|TU|WE|TH|FR|SA|SU)';
const numbers = (lo: number, hi: number) => (v: string) => v.split(',').every((p) => /^[+-]?\d{1,3}$/.test(p) && Math.abs(Number(p)) >= lo && Math.abs(Number(p)) <= hi);
const RULE_PARTS: Record<string, [check: (v: string) => boolean, allowed: string]> = {
  FREQ: [(v) => ['DAILY', 'WEEKLY', 'MONTHLY', 'YEARLY'].includes(v), 'DAILY, WEEKLY, MONTHLY or YEARLY'],
  INTERVAL: [(v) => /^\d{1,2}$/.test(v) && Number(v) >= 1, 'a whole number from 1 to 99'],
  COUNT: [(v) => /^\d{1,4}$/.test(v) && Number(v) >= 1, 'a whole number from 1'],
  UNTIL: [(v) => /^\d{8}(T\d{6}Z?)?$/.test(v), 'a date as YYYYMMDD'],
  BYDAY: [(v) => new RegExp(`^${WEEKDAY_PART}(,${WEEKDAY_PART})*$`).test(v), 'weekdays MO, TU, WE, TH, FR, SA, SU separated by commas'],
  BYMONTHDAY: [numbers(1, 31), 'days of the month 1 to 31'],
  BYMONTH: [numbers(1, 12), 'months 1 to 12'],
  BYSETPOS: [numbers(1, 366), 'positions such as 1 or -1'],
  BYWEEKNO: [numbers(1, 53), 'week numbers 1 to 53'],
  WKST: [(v) => /^(MO|TU|WE|TH|FR|SA|SU)$/.test(v), 'one weekday such as MO'],
};
export const RULE_EXAMPLE = 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR';

/**
 * A working pattern's repeat rule, normalised (no "RRULE:" prefix, upper case), or why it is not valid
 * in words. Times of day come from the pattern's start and end, so the rule names days only.
 */
export function checkPatternRule(input: string): { ok: true; rule: string } | { ok: false; message: string } {
  const rule = input.trim().replace(/^RRULE:/i, '').toUpperCase();
  const fail = (why: string) => ({ ok: false as const, message: `That repeat rule is not valid: ${why}; e.g. ${RULE_EXAMPLE}` });
  if (!rule) return fail('it is empty');
  if (/[\r\n]|DTSTART/.test(rule)) return fail('write one RRULE line without DTSTART (the pattern starts on its “from” date)');
  const seen = new Set<string>();
  for (const part of rule.split(';')) {
    const [k, v, extra] = part.split('=');
    if (/^BY(HOUR|MINUTE|SECOND)$/.test(k)) return fail(`${k} is not used: the start and end times give the hours`);
    if (extra !== undefined || v === undefined || !(k in RULE_PARTS)) return fail(`“${part}” is not a rule part Lashline reads`);
    if (seen.has(k)) return fail(`${k} is given twice`);
    seen.add(k);
    const [ok, allowed] = RULE_PARTS[k];
    if (!ok(v)) return fail(`${k} must be ${allowed}, not “${v}”`);
  }
  if (!seen.has('FREQ')) return fail('it has no FREQ (DAILY, WEEKLY, MONTHLY or YEARLY)');
  if (seen.has('COUNT') && seen.has('UNTIL')) return fail('it has both COUNT and UNTIL; keep one');
  try {
    rrulestr(`RRULE:${rule}`, { dtstart: new Date(Date.UTC(2026, 0, 5)) });
  } catch (err) {
    return fail(err instanceof Error ? err.message : String(err));
  }
  return { ok: true, rule };
}

/**
 * The calendar days a pattern works on in [firstDay, lastDay] (both included), in order. The rule runs
 * on the site's wall clock as floating values (rrule reads UTC fields as local), DTSTART = the pattern's
 * first day at its start time, so an INTERVAL=2 weekly rule counts its weeks from `startsOn`. An UNTIL
 * in UTC (…Z) is that instant; a date-only UNTIL takes in the whole of that day.
 */
export function patternDays(p: Pick<PatternRow, 'rrule' | 'startsOn' | 'endsOn' | 'startTime'>, firstDay: string, lastDay: string, timeZone: string): string[] {
  const c = checkPatternRule(p.rrule);
  if (!c.ok) throw new RangeError(c.message);
  const last = p.endsOn && p.endsOn < lastDay ? p.endsOn : lastDay;
  const first = p.startsOn > firstDay ? p.startsOn : firstDay;
  if (first > last) return [];
  const startMinutes = minutesOf(p.startTime) ?? 0;
  const options = RRule.parseString(c.rule);
  const until = /UNTIL=(\d{8})(T\d{6})?(Z?)/.exec(c.rule);
  if (until && options.until) {
    if (!until[2]) options.until = new Date(options.until.getTime() + DAY_MS - 1000);
    else if (until[3] === 'Z') options.until = new Date(wallClock(options.until.getTime(), timeZone));
  }
  const rr = new RRule({ ...options, dtstart: new Date(toUtcDate(p.startsOn).getTime() + startMinutes * 60_000) });
  const out: string[] = [];
  rr.between(toUtcDate(first), new Date(toUtcDate(last).getTime() + DAY_MS - 1), true, (d) => {
    out.push(d.toISOString().slice(0, 10));
    return out.length < MAX_DAYS;
  });
  return out;
}

/** The wall clock of `timeZone` at an instant, as a floating value (its UTC fields are the local time). */
function wallClock(instant: number, timeZone: string): number {
  const z = new TZDate(instant, timeZone);
  return Date.UTC(z.getFullYear(), z.getMonth(), z.getDate(), z.getHours(), z.getMinutes(), z.getSeconds());
}

/** Every calendar day the time off covers. */
export function timeOffDays(off: readonly TimeOffRow[]): Set<string> {
  const days = new Set<string>();
  for (const o of off) for (let d = o.firstDay; d <= o.lastDay && days.size < 100_000; d = addDaysIso(d, 1)) days.add(d);
  return days;
}

/**
 * A technician's working time inside [from, to): each pattern's days (its RRULE from `startsOn`, up to
 * `endsOn`), local start and end times as instants, less whole days of time off, clipped to the site's
 * opening hours, merged and sorted.
 */
export function technicianShifts(
  patterns: readonly PatternRow[],
  timeOff: readonly TimeOffRow[],
  open: readonly Interval[],
  timeZone: string,
  from: number,
  to: number,
): Interval[] {
  const days = daysCovering(timeZone, from, to);
  if (!days.length) return [];
  const away = timeOffDays(timeOff);
  const raw: Interval[] = [];
  for (const p of patterns) {
    const s = minutesOf(p.startTime);
    const e = minutesOf(p.endTime);
    if (s === null || e === null || e <= s) continue;
    for (const day of patternDays(p, days[0], days[days.length - 1], timeZone)) {
      if (away.has(day)) continue;
      const i = clip({ start: localInstant(day, p.startTime, timeZone), end: localInstant(day, p.endTime, timeZone) }, from, to);
      if (i) raw.push(i);
    }
  }
  return intersectIntervals(raw, open);
}

/** A pattern in plain words: "every week on Monday, Tuesday, Wednesday, Thursday, Friday, 08:00–16:30". */
export function patternInWords(rrule: string, startTime: string, endTime: string): string {
  const c = checkPatternRule(rrule);
  const days = c.ok ? new RRule(RRule.parseString(c.rule)).toText() : rrule;
  return `${days}, ${startTime}–${endTime}`;
}

/** Working minutes per calendar day at the site, an interval across midnight split between its days. */
export function minutesPerDay(intervals: readonly Interval[], timeZone: string): Map<string, number> {
  const out = new Map<string, number>();
  for (const i of mergeIntervals(intervals)) {
    for (const day of daysCovering(timeZone, i.start, i.end)) {
      const part = clip(i, startOfDayInZone(day, timeZone), startOfDayInZone(addDaysIso(day, 1), timeZone));
      if (part) out.set(day, (out.get(day) ?? 0) + (part.end - part.start) / 60_000);
    }
  }
  return out;
}

/**
 * The first day two patterns of one person both work with overlapping hours, or null. Looked for over
 * their shared dates, at most two years from the later start (every weekly rule repeats well within it).
 */
export function firstClash(a: PatternRow, b: PatternRow, timeZone: string): string | null {
  const [as, ae, bs, be] = [minutesOf(a.startTime), minutesOf(a.endTime), minutesOf(b.startTime), minutesOf(b.endTime)];
  if (as === null || ae === null || bs === null || be === null || !(as < be && bs < ae)) return null;
  const first = a.startsOn > b.startsOn ? a.startsOn : b.startsOn;
  let last = addDaysIso(first, 731);
  for (const end of [a.endsOn, b.endsOn]) if (end && end < last) last = end;
  if (first > last) return null;
  const bDays = new Set(patternDays(b, first, last, timeZone));
  return patternDays(a, first, last, timeZone).find((d) => bDays.has(d)) ?? null;
}

/** The RRULE the pattern editor writes: chosen weekdays, every week or every other week. */
export function weeklyRule(weekdays: readonly number[], everyOtherWeek: boolean): string {
  const days = [...new Set(weekdays)].sort((x, y) => x - y).map((d) => RULE_DAYS[d - 1]);
  return `FREQ=WEEKLY;${everyOtherWeek ? 'INTERVAL=2;' : ''}BYDAY=${days.join(',')}`;
}

/** The editor's reading of a rule it can show as checkboxes, or null for any other rule. */
export function readWeeklyRule(rule: string): { weekdays: number[]; everyOtherWeek: boolean } | null {
  const m = /^FREQ=WEEKLY(?:;INTERVAL=([12]))?;BYDAY=((?:MO|TU|WE|TH|FR|SA|SU)(?:,(?:MO|TU|WE|TH|FR|SA|SU))*)$/.exec(rule.trim().toUpperCase());
  if (!m) return null;
  return { weekdays: m[2].split(',').map((d) => RULE_DAYS.indexOf(d as (typeof RULE_DAYS)[number]) + 1).sort((x, y) => x - y), everyOtherWeek: m[1] === '2' };
}
