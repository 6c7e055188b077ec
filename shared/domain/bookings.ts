import { TZDate } from '@date-fns/tz';
import { RRule } from './rrule';

// When bikes are needed. A booking repeats by an RFC 5545 RRULE counted from its start, and the rule
// runs on the SITE's wall clock: a weekly 09:00 lesson stays at 09:00 local across a daylight-saving
// change. rrule itself works in "floating" dates (UTC fields read as local time), so expansion runs
// on wall-clock values and each occurrence is turned back into an instant in the site's zone.

export const MAX_BOOKING_DAYS = 60;
export const DAY_MS = 86_400_000;
/** Enough for a daily rule over the 60-day horizon many times over; stops a runaway rule. */
const MAX_OCCURRENCES = 2000;

export type BookingKind = 'hire' | 'lesson';

export interface BookingRow {
  id: string;
  siteId: string;
  kind: BookingKind;
  bikeId: string | null;
  modelId: string | null;
  quantity: number;
  startAt: Date | string;
  endAt: Date | string;
  rrule: string | null;
  title: string;
}

export interface BookingOccurrence {
  bookingId: string;
  siteId: string;
  kind: BookingKind;
  bikeId: string | null;
  modelId: string | null;
  quantity: number;
  title: string;
  start: number;
  end: number;
}

const ms = (d: Date | string | number) => (typeof d === 'number' ? d : new Date(d).getTime());

/** The wall clock of `timeZone` at an instant, as a floating value (its UTC fields are the local time). */
export function wallClock(instant: number, timeZone: string): number {
  const z = new TZDate(instant, timeZone);
  return Date.UTC(z.getFullYear(), z.getMonth(), z.getDate(), z.getHours(), z.getMinutes(), z.getSeconds());
}

/** The instant a floating wall-clock value stands for in `timeZone` (a time in a spring-forward gap moves on). */
export function fromWallClock(floating: number, timeZone: string): number {
  const d = new Date(floating);
  return new TZDate(d.getUTCFullYear(), d.getUTCMonth(), d.getUTCDate(), d.getUTCHours(), d.getUTCMinutes(), d.getUTCSeconds(), timeZone).getTime();
}

/** A time zone name the runtime knows (IANA, e.g. Europe/London). */
export function isTimeZone(name: string): boolean {
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: name });
    return true;
  } catch {
    return false;
  }
}

// ── Rules ────────────────────────────────────────────────────────────────────
const WEEKDAY = '(?:[+-]?\\d{1,2})?(?:MO|TU|WE|TH|FR|SA|SU)';
const num = (lo: number, hi: number, signed = false) => (v: string) =>
  v.split(',').every((p) => /^[+-]?\d{1,3}$/.test(p) && (signed || !p.startsWith('-')) && Math.abs(Number(p)) >= lo && Math.abs(Number(p)) <= hi);
const PARTS: Record<string, (v: string) => boolean> = {
  FREQ: (v) => ['DAILY', 'WEEKLY', 'MONTHLY', 'YEARLY'].includes(v),
  INTERVAL: (v) => /^\d{1,3}$/.test(v) && Number(v) >= 1,
  COUNT: (v) => /^\d{1,4}$/.test(v) && Number(v) >= 1,
  UNTIL: (v) => /^\d{8}(T\d{6}Z?)?$/.test(v),
  BYDAY: (v) => new RegExp(`^${WEEKDAY}(,${WEEKDAY})*$`).test(v),
  BYMONTHDAY: num(1, 31, true),
  BYMONTH: num(1, 12),
  BYSETPOS: num(1, 366, true),
  BYYEARDAY: num(1, 366, true),
  BYWEEKNO: num(1, 53, true),
  BYHOUR: num(0, 23),
  BYMINUTE: num(0, 59),
  WKST: (v) => /^(MO|TU|WE|TH|FR|SA|SU)$/.test(v),
};

/** The rule without an optional "RRULE:" prefix, upper case, or a sentence saying what is wrong with it. */
export function checkRule(input: string): { ok: true; rule: string } | { ok: false; message: string } {
  const rule = input.trim().replace(/^RRULE:/i, '').toUpperCase();
  const fail = (why: string) => ({ ok: false as const, message: `The repeat rule “${input.trim()}” ${why} Write an RFC 5545 RRULE such as FREQ=WEEKLY;BYDAY=SA;UNTIL=20270131.` });
  if (!rule) return fail('is empty.');
  if (/[\r\n]|DTSTART/.test(rule)) return fail('must be one RRULE line without DTSTART (the booking’s start is its first time).');
  const seen = new Set<string>();
  for (const part of rule.split(';')) {
    const [k, v, extra] = part.split('=');
    if (extra !== undefined || v === undefined || !(k in PARTS)) return fail(`has “${part}”, which is not a rule part Lashline reads.`);
    if (seen.has(k)) return fail(`names ${k} twice.`);
    seen.add(k);
    if (!PARTS[k](v)) return fail(`has a value for ${k} that is not allowed (“${v}”).`);
  }
  if (!seen.has('FREQ')) return fail('has no FREQ (DAILY, WEEKLY, MONTHLY or YEARLY).');
  if (seen.has('COUNT') && seen.has('UNTIL')) return fail('has both COUNT and UNTIL; keep one.');
  return { ok: true, rule };
}

/** The rule in plain words, e.g. "every week on Saturday until January 31, 2027". */
export function ruleText(rule: string | null): string | null {
  if (!rule) return null;
  const c = checkRule(rule);
  return c.ok ? new RRule(RRule.parseString(c.rule)).toText() : null;
}

export interface Expand {
  start: number;
  end: number;
  rule: string | null;
  timeZone: string;
  from: number;
  to: number;
}

/**
 * The occurrences of one (possibly repeating) interval that overlap [from, to), in order. Each repeat
 * keeps the first one's wall-clock start and length, so 09:00–12:00 stays 09:00–12:00 local.
 * An UNTIL in UTC (…Z) is an instant; a date-only UNTIL means the end of that day at the site.
 */
export function expandInterval({ start, end, rule, timeZone, from, to }: Expand): { start: number; end: number }[] {
  if (!rule) return start < to && end > from ? [{ start, end }] : [];
  const c = checkRule(rule);
  if (!c.ok) throw new RangeError(c.message);
  const wallStart = wallClock(start, timeZone);
  const length = wallClock(end, timeZone) - wallStart;
  const options = RRule.parseString(c.rule);
  const until = /UNTIL=(\d{8})(T\d{6})?(Z?)/.exec(c.rule);
  if (until && options.until) {
    if (!until[2]) options.until = new Date(options.until.getTime() + DAY_MS - 1000);
    else if (until[3] === 'Z') options.until = new Date(wallClock(options.until.getTime(), timeZone));
  }
  const rr = new RRule({ ...options, dtstart: new Date(wallStart) });
  const lo = new Date(wallClock(from, timeZone) - Math.max(length, 0) - 2 * DAY_MS);
  const hi = new Date(wallClock(to, timeZone) + 2 * DAY_MS);
  const out: { start: number; end: number }[] = [];
  let n = 0;
  rr.between(lo, hi, true, (d) => {
    const s = fromWallClock(d.getTime(), timeZone);
    const e = fromWallClock(d.getTime() + length, timeZone);
    if (s < to && e > from) out.push({ start: s, end: Math.max(e, s + 60_000) });
    return ++n < MAX_OCCURRENCES;
  });
  return out;
}

/** Every booking's occurrences overlapping [from, to), expanded on its site's wall clock; sorted by start. */
export function bookingOccurrences(rows: readonly BookingRow[], timeZones: Record<string, string>, from: number, to: number): BookingOccurrence[] {
  const out: BookingOccurrence[] = [];
  for (const b of rows) {
    const timeZone = timeZones[b.siteId] ?? 'Europe/London';
    for (const o of expandInterval({ start: ms(b.startAt), end: ms(b.endAt), rule: b.rrule, timeZone, from, to }))
      out.push({ bookingId: b.id, siteId: b.siteId, kind: b.kind, bikeId: b.bikeId, modelId: b.modelId, quantity: b.quantity, title: b.title, ...o });
  }
  return out.sort((a, b) => a.start - b.start || a.bookingId.localeCompare(b.bookingId));
}

// ── Times as people type them ────────────────────────────────────────────────
const LOCAL = /^(\d{4})-(\d{2})-(\d{2})[ T](\d{2}):(\d{2})(?::(\d{2}))?$/;
const WITH_OFFSET = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/;

/**
 * An instant from "2026-12-12 09:00" (the site's local time) or an ISO 8601 time with an offset
 * ("2026-12-12T09:00:00Z", "…+01:00"); null when it is neither or names no real time.
 */
export function parseBookingTime(text: string, timeZone: string): number | null {
  const s = text.trim();
  if (WITH_OFFSET.test(s)) {
    const t = Date.parse(s);
    return Number.isNaN(t) ? null : t;
  }
  const m = LOCAL.exec(s);
  if (!m) return null;
  const [y, mo, d, h, mi, se] = [m[1], m[2], m[3], m[4], m[5], m[6] ?? '0'].map(Number);
  const floating = Date.UTC(y, mo - 1, d, h, mi, se);
  const back = new Date(floating);
  if (back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d || h > 23 || mi > 59 || se > 59) return null;
  return fromWallClock(floating, timeZone);
}

/** What is wrong with a booking's times, in words; null when they are fine. */
export function timesProblem(start: number, end: number): string | null {
  if (!(end > start)) return 'The end is not after the start. Give an end later than the start.';
  if (end - start > MAX_BOOKING_DAYS * DAY_MS) return `A booking may last at most ${MAX_BOOKING_DAYS} days. Split a longer one, or repeat a shorter one.`;
  return null;
}

/** A bike count in event text: "×3", "x3", "x 3" (a word such as "box3" does not count). */
export function quantityInText(text: string): number | null {
  const m = /(?:×|(?<![A-Za-z0-9])x)\s?(\d{1,3})(?!\d)/i.exec(text);
  return m && Number(m[1]) >= 1 ? Number(m[1]) : null;
}
