import { describe, it, expect } from 'vitest';
import { addMonths, format, getDaysInMonth } from 'date-fns';
import { TZDate } from '@date-fns/tz';
import * as rruleModule from 'rrule';
import { addDaysIso, addMonthsIso, compareIso, daysBetween, daysInMonth, isIsoDate, todayInZone } from '../../shared/domain/dates';
import { computeDue, dueAtKmFor, describeRule, nextRuleDate, parseRule, ruleOccurrences, validateRule } from '../../shared/domain/due';

type RruleModule = typeof rruleModule;
const { RRule } = (Reflect.get(rruleModule, 'default') as RruleModule | undefined) ?? rruleModule;

// date-fns addMonths, run on UTC wall time so the test machine's zone cannot matter.
const dateFnsAddMonths = (iso: string, n: number) => {
  const [y, m, d] = iso.split('-').map(Number);
  return format(addMonths(new TZDate(y, m - 1, d, 'UTC'), n), 'yyyy-MM-dd');
};

describe('calendar dates', () => {
  it('clamps month arithmetic like date-fns addMonths', () => {
    // Reference: date-fns addMonths (and trade-references.md: 31 Aug + 6 months = 28 Feb, 29 in a leap year).
    expect(addMonthsIso('2024-08-31', 6)).toBe('2025-02-28');
    expect(addMonthsIso('2023-08-31', 6)).toBe('2024-02-29');
    for (const [d, n] of [['2024-08-31', 6], ['2023-08-31', 6], ['2024-01-31', 1], ['2024-02-29', 12], ['2024-03-31', -1], ['2025-05-31', -15]] as const) {
      expect(addMonthsIso(d, n)).toBe(dateFnsAddMonths(d, n));
    }
  });

  it('steps from the anchor: +12 from 31 Aug is 31 Aug, two chained +6 steps are 28 Aug', () => {
    // Reference: date-fns addMonths gives the same for both (trade-references.md "Compute each step from the anchor").
    expect(addMonthsIso('2024-08-31', 12)).toBe('2025-08-31');
    expect(addMonthsIso(addMonthsIso('2024-08-31', 6), 6)).toBe('2025-08-28');
    expect(dateFnsAddMonths(dateFnsAddMonths('2024-08-31', 6), 6)).toBe('2025-08-28');
  });

  it('adds days and counts days across month, year and leap-day boundaries', () => {
    // Gregorian calendar facts: 2024 is a leap year (366 days), 2025 is not.
    expect(addDaysIso('2024-02-28', 1)).toBe('2024-02-29');
    expect(addDaysIso('2025-02-28', 1)).toBe('2025-03-01');
    expect(addDaysIso('2025-01-01', -1)).toBe('2024-12-31');
    expect(daysBetween('2024-01-01', '2025-01-01')).toBe(366);
    expect(daysBetween('2025-01-01', '2024-01-01')).toBe(-366);
    // 30 March 2025 is the UK's clock change (Summer Time Order); whole days are unaffected.
    expect(daysBetween('2025-03-29', '2025-03-31')).toBe(2);
  });

  it('counts the days of every month like date-fns getDaysInMonth', () => {
    // Reference: date-fns getDaysInMonth on UTC dates; Gregorian leap rule (1900 is not leap, 2000 is).
    for (const year of [1, 99, 100, 1600, 1900, 2000, 2023, 2024, 2100, 2400, 9999]) {
      for (let month = 1; month <= 12; month++) {
        expect(daysInMonth(year, month), `${year}-${month}`).toBe(getDaysInMonth(new TZDate(year, month - 1, 1, 'UTC')));
      }
    }
    expect(daysInMonth(1900, 2)).toBe(28);
    expect(daysInMonth(2000, 2)).toBe(29);
  });

  it('validates and compares YYYY-MM-DD dates', () => {
    expect(isIsoDate('2024-02-29')).toBe(true);
    expect(isIsoDate('2025-02-29')).toBe(false);
    expect(isIsoDate('2025-1-01')).toBe(false);
    expect(isIsoDate('2025-01-01T00:00:00Z')).toBe(false);
    expect(compareIso('2025-01-02', '2025-01-10')).toBe(-1);
    expect(compareIso('2025-01-10', '2025-01-10')).toBe(0);
    expect(() => addMonthsIso('31/08/2024', 6)).toThrow(/YYYY-MM-DD/);
    expect(() => addMonthsIso('2024-08-31', 1.5)).toThrow(/whole/);
  });

  it("gives a site's calendar date in its own time zone", () => {
    // Reference: ECMA-402 Intl.DateTimeFormat with the IANA zone ('en-CA' formats as YYYY-MM-DD).
    const intl = (zone: string, at: Date) => new Intl.DateTimeFormat('en-CA', { timeZone: zone }).format(at);
    const late = new Date('2025-06-30T23:30:00Z'); // 00:30 BST on 1 July in London
    expect(todayInZone('Europe/London', late)).toBe('2025-07-01');
    expect(todayInZone('UTC', late)).toBe('2025-06-30');
    for (const zone of ['Europe/London', 'Pacific/Auckland', 'America/Los_Angeles', 'Asia/Kolkata']) {
      for (const at of [late, new Date('2025-03-30T00:59:59Z'), new Date('2025-10-26T01:00:00Z')]) {
        expect(todayInZone(zone, at)).toBe(intl(zone, at));
      }
    }
    expect(() => todayInZone('Mars/Olympus_Mons')).toThrow(/time zone/);
  });
});

describe('repeat rules', () => {
  it("reproduces RFC 5545's own BYMONTHDAY=15,30 example", () => {
    // RFC 5545 section 3.3.10 (invalid dates such as 30 February are skipped): DTSTART 2007-01-15,
    // FREQ=MONTHLY;BYMONTHDAY=15,30;COUNT=5 → Jan 15, Jan 30, Feb 15, Mar 15, Mar 30.
    expect(ruleOccurrences('FREQ=MONTHLY;BYMONTHDAY=15,30;COUNT=5', '2007-01-15', 10)).toEqual([
      '2007-01-15', '2007-01-30', '2007-02-15', '2007-03-15', '2007-03-30',
    ]);
  });

  it('skips invalid dates rather than clamping (RFC 5545 3.3.10), unlike month arithmetic', () => {
    // RFC 5545 3.3.10 (values in trade-references.md): from 31 Aug, FREQ=MONTHLY;INTERVAL=6 lands on 31 Aug each year; February has no 31st.
    expect(ruleOccurrences('FREQ=MONTHLY;INTERVAL=6', '2024-08-31', 3)).toEqual(['2024-08-31', '2025-08-31', '2026-08-31']);
    // BYMONTHDAY=-1 is the last day of each month (RFC 5545 3.3.10).
    expect(ruleOccurrences('FREQ=MONTHLY;BYMONTHDAY=-1', '2024-01-15', 3)).toEqual(['2024-01-31', '2024-02-29', '2024-03-31']);
  });

  it('finds the next 1 March strictly after the baseline, matching the rrule package', () => {
    const rule = 'FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1';
    // Reference: rrule's own after() on a UTC DTSTART.
    const direct = new RRule({ ...RRule.parseString(rule), dtstart: new Date(Date.UTC(2025, 1, 20)) });
    expect(direct.after(new Date(Date.UTC(2025, 1, 20)))?.toISOString().slice(0, 10)).toBe('2025-03-01');
    expect(nextRuleDate(rule, '2025-02-20')).toBe('2025-03-01');
    expect(nextRuleDate(rule, '2025-03-01')).toBe('2026-03-01');
    expect(nextRuleDate(rule, '2025-06-10')).toBe('2026-03-01');
  });

  it("describes a rule in plain words with rrule's toText()", () => {
    const rule = 'FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1';
    // Reference: rrule toText() directly.
    expect(describeRule(rule)).toBe(RRule.fromString(rule).toText());
    expect(describeRule(rule)).toBe('every March on the 1st');
    expect(describeRule('RRULE:freq=monthly;interval=6')).toBe('every 6 months');
  });

  it('explains what is wrong with a bad rule', () => {
    expect(validateRule('FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1')).toBeNull();
    expect(validateRule('')).toMatch(/empty/);
    expect(validateRule('BYMONTH=3')).toMatch(/needs FREQ/);
    expect(validateRule('FREQ=FORTNIGHTLY')).toMatch(/FREQ needs YEARLY, MONTHLY, WEEKLY or DAILY/);
    expect(validateRule('FREQ=HOURLY')).toMatch(/whole days/);
    expect(validateRule('FREQ=DAILY;BYHOUR=9')).toMatch(/BYHOUR/);
    expect(validateRule('FREQ=YEARLY;BYMONTH=13')).toMatch(/BYMONTH needs months 1 to 12/);
    // rrule alone would loop for ever on a fractional INTERVAL.
    expect(validateRule('FREQ=MONTHLY;INTERVAL=2.5')).toMatch(/INTERVAL/);
    expect(validateRule('FREQ=YEARLY;BYMONTH=2;BYMONTHDAY=30')).toMatch(/No calendar date/);
    // Parsed rules are remembered: the same text refused twice says the same, and a caller changing
    // the options it got back cannot change the next answer.
    expect(validateRule('FREQ=YEARLY;BYMONTH=2;BYMONTHDAY=30')).toMatch(/No calendar date/);
    const first = parseRule('FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1');
    first.bymonth = 7;
    expect(parseRule('FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1').bymonth).toBe(3);
    expect(nextRuleDate('FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1', '2025-06-01')).toBe('2026-03-01');
    expect(validateRule('FREQ=MONTHLY;COUNT=3;UNTIL=20300101')).toMatch(/not both/);
    // RFC 5545 3.3.10: BYWEEKNO only with YEARLY; BYMONTHDAY not with WEEKLY.
    expect(validateRule('FREQ=MONTHLY;BYWEEKNO=3')).toMatch(/BYWEEKNO/);
    expect(validateRule('FREQ=WEEKLY;BYMONTHDAY=3')).toMatch(/BYMONTHDAY/);
    expect(validateRule('DTSTART:20250101\nRRULE:FREQ=YEARLY')).toMatch(/DTSTART/);
    expect(validateRule('FREQ=YEARLY;BYMONTH=2;BYMONTHDAY=29')).toBeNull();
    expect(() => parseRule('FREQ=YEARLY;COLOUR=RED')).toThrow(Error);
  });
});

describe('computeDue: whichever comes first', () => {
  // Oil every 5,000 km or 6 months (factory maintenance charts word intervals this way; common practice).
  const oil = { everyKm: 5_000, everyMonths: 6 };
  const lastDone = { date: '2025-01-10', odometerKm: 12_000 };
  const inService = { date: '2023-04-01', odometerKm: 3 };
  const riddenDaily = (from: string, km: number, perDay: number, count: number, step: number) =>
    Array.from({ length: count }, (_, i) => ({ date: addDaysIso(from, i * step), odometerKm: km + i * step * perDay }));

  it('a rental bike doing 100 km a day comes due by km long before the six months', () => {
    const readings = riddenDaily('2025-01-10', 12_000, 100, 5, 10); // last: 20 Feb, 16,000 km
    const due = computeDue({ interval: oil, lastDone, inService, readings, today: '2025-02-20' });
    expect(due).toMatchObject({
      dueAtKm: 17_000, dueByDate: '2025-07-10', currentKm: 16_000, remainingKm: 1_000, usageKmPerDay: 100,
      projectedDateForKm: '2025-03-02', dueDate: '2025-03-02', trigger: 'km', remainingDays: 10, status: 'ok',
      baseline: { date: '2025-01-10', odometerKm: 12_000, kind: 'last-done' },
    });
  });

  it('puts the next km limit at the last service plus the interval, or the first service km from new', () => {
    // Common practice: a running-in service at 1,000 km, then every 5,000 km from the last one done.
    const interval = { everyKm: 5_000, firstAtKm: 1_000 };
    expect(dueAtKmFor(interval, null, inService)).toBe(1_003);
    expect(dueAtKmFor(interval, lastDone, inService)).toBe(17_000);
    expect(dueAtKmFor({ everyKm: null }, lastDone, inService)).toBeNull();
    expect(computeDue({ interval: { ...oil, firstAtKm: 1_000 }, lastDone, inService, readings: [], today: '2025-02-20' }).dueAtKm).toBe(dueAtKmFor(interval, lastDone, inService));
  });

  it('takes a usage rate worked out once per bike and gives the same answer', () => {
    // Same trade example as above (100 km a day, 1,000 km to go: due in 10 days); the rate is passed in.
    const readings = riddenDaily('2025-01-10', 12_000, 100, 5, 10);
    const plain = computeDue({ interval: oil, lastDone, inService, readings, today: '2025-02-20' });
    expect(computeDue({ interval: oil, lastDone, inService, readings, today: '2025-02-20', usageKmPerDay: 100 })).toEqual(plain);
    // A bike known to stand still has no km date, whatever the readings say.
    expect(computeDue({ interval: oil, lastDone, inService, readings, today: '2025-02-20', usageKmPerDay: null })).toMatchObject({ projectedDateForKm: null, trigger: 'calendar' });
  });

  it('the same bike turns "soon" within 500 km and "overdue" on reaching the km', () => {
    const soon = computeDue({ interval: oil, lastDone, inService, readings: riddenDaily('2025-01-10', 12_000, 100, 6, 9), today: '2025-02-24' });
    expect(soon).toMatchObject({ currentKm: 16_500, remainingKm: 500, status: 'soon', trigger: 'km' });
    const over = computeDue({ interval: oil, lastDone, inService, readings: riddenDaily('2025-01-10', 12_000, 100, 6, 10), today: '2025-03-03' });
    expect(over).toMatchObject({ currentKm: 17_000, remainingKm: 0, projectedDateForKm: '2025-03-03', status: 'overdue', trigger: 'km', remainingDays: 0 });
  });

  it('a barely ridden bike comes due by the calendar', () => {
    const readings = riddenDaily('2025-01-10', 12_000, 2, 16, 10); // 2 km a day, last on 2025-06-09
    const base = { interval: oil, lastDone, inService, readings };
    const june = computeDue({ ...base, today: '2025-06-20' });
    expect(june).toMatchObject({ dueByDate: '2025-07-10', dueDate: '2025-07-10', trigger: 'calendar', remainingDays: 20, status: 'ok', usageKmPerDay: 2 });
    expect(june.projectedDateForKm! > june.dueByDate!).toBe(true);
    expect(computeDue({ ...base, today: '2025-07-03' })).toMatchObject({ remainingDays: 7, status: 'soon' });
    expect(computeDue({ ...base, today: '2025-07-10' })).toMatchObject({ remainingDays: 0, status: 'soon' });
    expect(computeDue({ ...base, today: '2025-07-11' })).toMatchObject({ remainingDays: -1, status: 'overdue' });
  });

  it('clamps the calendar limit to the end of a short month (date-fns addMonths)', () => {
    const due = computeDue({ interval: oil, lastDone: { date: '2024-08-31', odometerKm: 100 }, inService, readings: [], today: '2024-09-01' });
    expect(due.dueByDate).toBe(dateFnsAddMonths('2024-08-31', 6));
    expect(due.dueByDate).toBe('2025-02-28');
  });

  it('counts the first service from going into service, then the regular interval', () => {
    const plan = { everyKm: 5_000, everyMonths: 6, firstAtKm: 1_000 };
    const newBike = { date: '2025-04-01', odometerKm: 4 };
    const first = computeDue({ interval: plan, inService: newBike, readings: [], today: '2025-04-02' });
    expect(first).toMatchObject({ dueAtKm: 1_004, dueByDate: '2025-10-01', baseline: { kind: 'in-service', odometerKm: 4 } });
    const after = computeDue({ interval: plan, inService: newBike, lastDone: { date: '2025-04-20', odometerKm: 1_010 }, readings: [], today: '2025-04-21' });
    expect(after.dueAtKm).toBe(6_010);
    // A first-only item (running-in check) has no km limit once done.
    const once = { firstAtKm: 1_000 };
    expect(computeDue({ interval: once, inService: newBike, readings: [], today: '2025-04-02' }).dueAtKm).toBe(1_004);
    expect(computeDue({ interval: once, inService: newBike, lastDone: { date: '2025-04-20', odometerKm: 1_010 }, readings: [], today: '2025-04-21' })).toMatchObject({
      dueAtKm: null, dueByDate: null, dueDate: null, trigger: null, remainingKm: null, remainingDays: null, status: 'ok',
    });
  });

  it('takes the earlier of a months limit and a yearly rule', () => {
    // Pre-season inspection every year on 1 March (FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1), or 12 months.
    const interval = { everyMonths: 12, rrule: 'FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1' };
    const done = { date: '2025-06-10', odometerKm: 20_000 };
    expect(computeDue({ interval, lastDone: done, inService, readings: [], today: '2025-07-01' })).toMatchObject({
      dueByDate: '2026-03-01', calendarSource: 'rule', trigger: 'calendar', projectedDateForKm: null, dueAtKm: null,
    });
    const early = { date: '2025-02-10', odometerKm: 20_000 };
    expect(computeDue({ interval: { ...interval, everyMonths: 1 }, lastDone: early, inService, readings: [], today: '2025-02-11' })).toMatchObject({
      dueByDate: '2025-03-01', calendarSource: 'rule',
    });
    expect(computeDue({ interval: { ...interval, everyMonths: 1 }, lastDone: { date: '2025-01-10', odometerKm: 0 }, inService, readings: [], today: '2025-01-11' })).toMatchObject({
      dueByDate: '2025-02-10', calendarSource: 'months',
    });
  });

  it('on a tie picks km when the km is already reached, else the calendar', () => {
    const readings = [{ date: '2025-07-01', odometerKm: 16_300 }, { date: '2025-06-01', odometerKm: 13_300 }]; // 100 km a day
    const tie = computeDue({ interval: oil, lastDone, inService, readings, today: '2025-07-03' });
    expect(tie).toMatchObject({ remainingKm: 700, projectedDateForKm: '2025-07-10', dueByDate: '2025-07-10', trigger: 'calendar' });
    const reached = computeDue({ interval: oil, lastDone, inService, readings: [{ date: '2025-07-10', odometerKm: 17_200 }], today: '2025-07-10' });
    expect(reached).toMatchObject({ projectedDateForKm: '2025-07-10', dueByDate: '2025-07-10', trigger: 'km', status: 'overdue' });
  });

  it('never lets the current km fall below the baseline, and ignores readings after today', () => {
    const due = computeDue({
      interval: oil, lastDone, inService, today: '2025-02-01',
      readings: [{ date: '2024-12-01', odometerKm: 11_500 }, { date: '2025-03-01', odometerKm: 19_000 }],
    });
    expect(due).toMatchObject({ currentKm: 12_000, remainingKm: 5_000 });
  });

  it('has no km date without a usage rate, and honours custom "soon" margins', () => {
    const due = computeDue({ interval: { everyKm: 3_000 }, lastDone, inService, readings: [], today: '2025-01-11' });
    expect(due).toMatchObject({ dueAtKm: 15_000, projectedDateForKm: null, dueDate: null, trigger: null, status: 'ok', usageKmPerDay: null });
    const wide = computeDue({ interval: { everyKm: 3_000 }, lastDone, inService, readings: [], today: '2025-01-11', soon: { km: 3_000 } });
    expect(wide.status).toBe('soon');
  });

  it('throws on malformed input', () => {
    expect(() => computeDue({ interval: oil, inService: { date: '2025-1-1', odometerKm: 0 }, readings: [], today: '2025-01-02' })).toThrow(/YYYY-MM-DD/);
    expect(() => computeDue({ interval: oil, inService, readings: [], today: 'today' })).toThrow(/YYYY-MM-DD/);
    expect(() => computeDue({ interval: { everyKm: -5 }, inService, readings: [], today: '2025-01-02' })).toThrow(/above 0/);
    expect(() => computeDue({ interval: { rrule: 'FREQ=SOMETIMES' }, inService, readings: [], today: '2025-01-02' })).toThrow(/FREQ/);
  });
});
