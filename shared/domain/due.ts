import type { Options as RuleOptions } from 'rrule';
import { addDaysIso, addMonthsIso, assertIsoDate, compareIso, daysBetween, fromUtcDate, isIsoDate, toUtcDate, type IsoDate } from './dates';
import { usageRate, type KmReading } from './usage';
import { RRule } from './rrule';

// ---- Repeat rules (RFC 5545 RRULE, whole days only) ----

const WEEKDAY = '(MO|TU|WE|TH|FR|SA|SU)';
const NUMBER_LIST = /^[+-]?\d{1,3}(,[+-]?\d{1,3})*$/;

function numbers(max: number, signed: boolean) {
  return (v: string) =>
    NUMBER_LIST.test(v) &&
    v.split(',').map(Number).every((n) => n !== 0 && Math.abs(n) <= max && (signed || n > 0));
}

function isUntil(v: string): boolean {
  const m = /^(\d{4})(\d{2})(\d{2})(T\d{6}Z?)?$/.exec(v);
  return m !== null && isIsoDate(`${m[1]}-${m[2]}-${m[3]}`);
}

// rrule's own parser accepts nonsense (BYMONTH=abc; INTERVAL=2.5 never returns), so every part is checked first.
const PARTS: Record<string, { ok: (v: string) => boolean; want: string }> = {
  FREQ: { ok: (v) => /^(YEARLY|MONTHLY|WEEKLY|DAILY)$/.test(v), want: 'YEARLY, MONTHLY, WEEKLY or DAILY' },
  INTERVAL: { ok: (v) => /^[1-9]\d{0,3}$/.test(v), want: 'a whole number from 1 to 9999' },
  COUNT: { ok: (v) => /^[1-9]\d{0,3}$/.test(v), want: 'a whole number from 1 to 9999' },
  UNTIL: { ok: isUntil, want: 'a date such as 20301231' },
  BYMONTH: { ok: numbers(12, false), want: 'months 1 to 12' },
  BYMONTHDAY: { ok: numbers(31, true), want: 'days 1 to 31 or -1 to -31' },
  BYYEARDAY: { ok: numbers(366, true), want: 'days 1 to 366 or -1 to -366' },
  BYWEEKNO: { ok: numbers(53, true), want: 'weeks 1 to 53 or -1 to -53' },
  BYSETPOS: { ok: numbers(366, true), want: 'positions 1 to 366 or -1 to -366' },
  BYDAY: {
    ok: (v) => v.split(',').every((d) => new RegExp(`^([+-]?([1-9]|[1-4]\\d|5[0-3]))?${WEEKDAY}$`).test(d)),
    want: 'weekdays such as MO,TH or 1MO, -1FR',
  },
  WKST: { ok: (v) => new RegExp(`^${WEEKDAY}$`).test(v), want: 'a weekday such as MO' },
};

function ruleProblem(parts: Map<string, string>): string | null {
  const freq = parts.get('FREQ');
  if (!freq) return 'The repeat rule needs FREQ, for example FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1.';
  if (parts.has('COUNT') && parts.has('UNTIL')) return 'Use COUNT or UNTIL in a repeat rule, not both.';
  // Combinations RFC 5545 (section 3.3.10) does not allow.
  if (parts.has('BYWEEKNO') && freq !== 'YEARLY') return 'BYWEEKNO only works with FREQ=YEARLY.';
  if (parts.has('BYYEARDAY') && freq !== 'YEARLY') return 'BYYEARDAY only works with FREQ=YEARLY.';
  if (parts.has('BYMONTHDAY') && freq === 'WEEKLY') return 'BYMONTHDAY does not work with FREQ=WEEKLY.';
  const numbered = /\d/.test(parts.get('BYDAY') ?? '');
  if (numbered && (freq === 'WEEKLY' || freq === 'DAILY' || parts.has('BYWEEKNO'))) {
    return 'Numbered weekdays such as 1MO only work with FREQ=MONTHLY or FREQ=YEARLY without BYWEEKNO.';
  }
  if (parts.has('BYSETPOS') && ![...parts.keys()].some((k) => k.startsWith('BY') && k !== 'BYSETPOS')) {
    return 'BYSETPOS needs another BY… part to pick from.';
  }
  return null;
}

/** The rule reduced to one YEARLY pass over the same days, to find rules no date can satisfy (31 April). */
function neverOccurs(parts: Map<string, string>): boolean {
  const freq = parts.get('FREQ');
  const keep = ['BYMONTH', 'BYMONTHDAY', 'BYYEARDAY', 'BYWEEKNO', 'BYDAY'].concat(freq === 'YEARLY' ? ['BYSETPOS'] : []);
  const probe = [...parts].filter(([k]) => keep.includes(k)).map(([k, v]) => `${k}=${v}`);
  // In a YEARLY rule with BYMONTH, 1MO means the first Monday of each month, as in a MONTHLY rule.
  if (freq === 'MONTHLY' && !parts.has('BYMONTH')) probe.push('BYMONTH=1,2,3,4,5,6,7,8,9,10,11,12');
  const rule = new RRule({ ...RRule.parseString(['FREQ=YEARLY', ...probe].join(';')), dtstart: new Date(Date.UTC(2000, 0, 1)) });
  return rule.after(new Date(Date.UTC(2000, 0, 1)), true) === null;
}

/**
 * Reads an RFC 5545 RRULE ('FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1', an
 * optional 'RRULE:' prefix allowed). Rules count from the last time the work
 * was done, so DTSTART is not accepted, nor times of day. Throws an Error
 * saying what to change.
 */
export function parseRule(text: string): Partial<RuleOptions> {
  const key = String(text);
  let parsed = parsedRules.get(key);
  if (parsed === undefined) {
    try {
      parsed = readRule(key);
    } catch (e) {
      parsed = e instanceof Error ? e : new Error(String(e));
    }
    // Every bike of a model shares its rules: parse each text once (a fleet scan would otherwise parse thousands of times).
    if (parsedRules.size >= 500) parsedRules.clear();
    parsedRules.set(key, parsed);
  }
  if (parsed instanceof Error) throw new Error(parsed.message);
  return { ...parsed };
}

const parsedRules = new Map<string, Partial<RuleOptions> | Error>();

function readRule(text: string): Partial<RuleOptions> {
  const body = String(text).trim().toUpperCase().replace(/^RRULE:/, '').replace(/;$/, '');
  if (body === '') throw new Error('The repeat rule is empty: write one such as FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1.');
  if (/DTSTART|TZID/.test(body)) throw new Error('Leave DTSTART out of the repeat rule: it counts from the last time the work was done.');
  const parts = new Map<string, string>();
  for (const piece of body.split(';')) {
    const [name, value, extra] = piece.split('=');
    if (name === 'FREQ' && /^(HOURLY|MINUTELY|SECONDLY)$/.test(value ?? '')) {
      throw new Error('Repeat rules work in whole days: use FREQ=DAILY, WEEKLY, MONTHLY or YEARLY.');
    }
    if (/^BY(HOUR|MINUTE|SECOND)$/.test(name)) throw new Error(`Remove ${name}: repeat rules work in whole days.`);
    const part = PARTS[name];
    if (!part) throw new Error(`"${piece}" is not a part of a repeat rule this product understands.`);
    if (value === undefined || extra !== undefined || !part.ok(value)) throw new Error(`${name} needs ${part.want}, got "${piece}".`);
    if (parts.has(name)) throw new Error(`${name} appears twice in the repeat rule.`);
    parts.set(name, value);
  }
  const problem = ruleProblem(parts);
  if (problem) throw new Error(problem);
  if (neverOccurs(parts)) throw new Error('No calendar date matches this repeat rule (such as 30 February): check its months and days.');
  return RRule.parseString([...parts].map(([k, v]) => `${k}=${v}`).join(';'));
}

/** An error message for the person editing the rule, or null when it is fine. */
export function validateRule(text: string): string | null {
  try {
    parseRule(text);
    return null;
  } catch (e) {
    return e instanceof Error ? e.message : String(e);
  }
}

/** The rule in plain words, as rrule's toText() gives it: "every March on the 1st". */
export function describeRule(text: string): string {
  return new RRule(parseRule(text)).toText();
}

function ruleFrom(text: string, start: IsoDate) {
  // Rule dates are floating calendar dates held at UTC midnight, read back with getUTC*.
  return new RRule({ ...parseRule(text), dtstart: toUtcDate(start) });
}

/** The rule's first date strictly after `start`, counting from DTSTART = `start`. */
export function nextRuleDate(text: string, start: IsoDate): IsoDate | null {
  const key = `${text}\n${start}`;
  if (nextDates.has(key)) return nextDates.get(key)!;
  const next = ruleFrom(text, start).after(toUtcDate(addDaysIso(start, 1)), true);
  const date = next ? fromUtcDate(next) : null;
  // Many bikes share a baseline date (a fleet serviced on one day): remember the answer.
  if (nextDates.size >= 5000) nextDates.clear();
  nextDates.set(key, date);
  return date;
}

const nextDates = new Map<string, IsoDate | null>();

/** The rule's first `limit` dates from DTSTART = `start` (included when it matches). */
export function ruleOccurrences(text: string, start: IsoDate, limit: number): IsoDate[] {
  return ruleFrom(text, start).all((_, i) => i < limit).map(fromUtcDate);
}

// ---- Due computation: whichever limit comes first ----

export interface ServiceInterval {
  everyKm?: number | null;
  everyMonths?: number | null;
  /** Km after going into service for the first time only (a running-in service). */
  firstAtKm?: number | null;
  /** RFC 5545 RRULE counted from the baseline date. */
  rrule?: string | null;
}

export type DueStatus = 'ok' | 'soon' | 'overdue';
export const DUE_STATUS_RANK: Record<DueStatus, number> = { ok: 0, soon: 1, overdue: 2 };
export const DEFAULT_SOON = { days: 7, km: 500 } as const;

export interface DueInput {
  interval: ServiceInterval;
  lastDone?: KmReading | null;
  inService: KmReading;
  /** Check-ins on the continuous km scale (see odometer.ts), any order. */
  readings: readonly KmReading[];
  today: IsoDate;
  soon?: { days?: number; km?: number };
  /** The bike's usage rate from usageRate(readings, today), when the caller has it already (one bike, many items). */
  usageKmPerDay?: number | null;
}

export interface DueResult {
  dueAtKm: number | null;
  dueByDate: IsoDate | null;
  /** Which calendar limit set dueByDate. */
  calendarSource: 'months' | 'rule' | null;
  projectedDateForKm: IsoDate | null;
  dueDate: IsoDate | null;
  trigger: 'km' | 'calendar' | null;
  currentKm: number;
  remainingKm: number | null;
  remainingDays: number | null;
  status: DueStatus;
  usageKmPerDay: number | null;
  baseline: KmReading & { kind: 'last-done' | 'in-service' };
}

/** Projections further out than this (about 100 years) mean "not by riding". */
export const MAX_PROJECTION_DAYS = 36_525;

function checkPoint(p: KmReading, label: string): void {
  assertIsoDate(p.date, `${label} date`);
  if (!Number.isFinite(p.odometerKm)) throw new Error(`The ${label} odometer must be a number, got ${p.odometerKm}`);
}

function positive(value: number | null | undefined, label: string, whole = false): number | null {
  if (value === null || value === undefined) return null;
  if (!Number.isFinite(value) || value <= 0 || (whole && !Number.isInteger(value))) {
    throw new Error(`${label} must be a ${whole ? 'whole ' : ''}number above 0, got ${value}`);
  }
  return value;
}

function calendarLimit(interval: ServiceInterval, from: IsoDate): Pick<DueResult, 'dueByDate' | 'calendarSource'> {
  const months = positive(interval.everyMonths, 'Months between services', true);
  const byMonths = months === null ? null : addMonthsIso(from, months);
  const byRule = interval.rrule ? nextRuleDate(interval.rrule, from) : null;
  if (byRule && (!byMonths || compareIso(byRule, byMonths) < 0)) return { dueByDate: byRule, calendarSource: 'rule' };
  return { dueByDate: byMonths, calendarSource: byMonths ? 'months' : null };
}

/**
 * The km at which an item next falls due: the last time it was done plus its interval, or going into
 * service plus the first-service km (else the interval). Null for an item with no km limit.
 */
export function dueAtKmFor(interval: Pick<ServiceInterval, 'everyKm' | 'firstAtKm'>, lastDone: KmReading | null, inService: KmReading): number | null {
  const everyKm = positive(interval.everyKm, 'Km between services');
  const firstAtKm = interval.firstAtKm ?? null;
  if (firstAtKm !== null && !(Number.isFinite(firstAtKm) && firstAtKm >= 0)) {
    throw new Error(`The first service km must be 0 or more, got ${firstAtKm}`);
  }
  const kmStep = lastDone ? everyKm : (firstAtKm ?? everyKm);
  return kmStep === null ? null : (lastDone ?? inService).odometerKm + kmStep;
}

export function computeDue(input: DueInput): DueResult {
  const { interval, lastDone, inService, readings, today } = input;
  assertIsoDate(today, 'date today');
  checkPoint(inService, 'in-service');
  if (lastDone) checkPoint(lastDone, 'last service');
  const dueAtKm = dueAtKmFor(interval, lastDone ?? null, inService);
  const soon = { days: input.soon?.days ?? DEFAULT_SOON.days, km: input.soon?.km ?? DEFAULT_SOON.km };

  const baseline = lastDone ? { ...lastDone, kind: 'last-done' as const } : { ...inService, kind: 'in-service' as const };
  const { dueByDate, calendarSource } = calendarLimit(interval, baseline.date);

  let currentKm = baseline.odometerKm;
  for (const r of readings) {
    checkPoint(r, 'reading');
    if (compareIso(r.date, today) <= 0 && r.odometerKm > currentKm) currentKm = r.odometerKm;
  }
  const remainingKm = dueAtKm === null ? null : dueAtKm - currentKm;
  const usageKmPerDay = input.usageKmPerDay !== undefined ? input.usageKmPerDay : usageRate(readings, today);

  let projectedDateForKm: IsoDate | null = null;
  if (remainingKm !== null && remainingKm <= 0) projectedDateForKm = today;
  else if (remainingKm !== null && usageKmPerDay !== null && usageKmPerDay > 0) {
    // Trim float noise first so 1000 / (1000 / 7) is 7 days, not 8.
    const days = Math.ceil(Number((remainingKm / usageKmPerDay).toPrecision(12)));
    if (days <= MAX_PROJECTION_DAYS) projectedDateForKm = addDaysIso(today, days);
  }

  // On a tie the km limit wins only when it is already reached; otherwise the
  // calendar date is a fixed fact and the km date only an estimate.
  const kmReached = dueAtKm !== null && currentKm >= dueAtKm;
  let trigger: DueResult['trigger'] = null;
  if (projectedDateForKm && dueByDate) {
    const order = compareIso(projectedDateForKm, dueByDate);
    trigger = order < 0 || (order === 0 && kmReached) ? 'km' : 'calendar';
  } else if (projectedDateForKm) trigger = 'km';
  else if (dueByDate) trigger = 'calendar';
  const dueDate = trigger === 'km' ? projectedDateForKm : trigger === 'calendar' ? dueByDate : null;
  const remainingDays = dueDate === null ? null : daysBetween(today, dueDate);

  let status: DueStatus = 'ok';
  if (kmReached || (dueByDate !== null && compareIso(today, dueByDate) > 0)) status = 'overdue';
  else if ((remainingKm !== null && remainingKm <= soon.km) || (remainingDays !== null && remainingDays <= soon.days)) {
    status = 'soon';
  }

  return {
    dueAtKm, dueByDate, calendarSource, projectedDateForKm, dueDate, trigger,
    currentKm, remainingKm, remainingDays, status, usageKmPerDay, baseline,
  };
}
