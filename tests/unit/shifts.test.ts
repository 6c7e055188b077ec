import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { TZDate } from '@date-fns/tz';
import { differenceInCalendarWeeks, eachDayOfInterval, format, isSaturday } from 'date-fns';
import rrulePkg from 'rrule';
import {
  checkPatternRule, firstClash, minutesPerDay, patternInWords, readWeeklyRule, siteOpenIntervals, technicianShifts, weeklyRule, type PatternRow,
} from '../../shared/domain/shifts';

const { rrulestr } = rrulePkg;
const NY = 'America/New_York';
const LONDON = 'Europe/London';
const HOUR = 3_600_000;
const local = (instant: number, tz: string, pattern = 'yyyy-MM-dd HH:mm') => format(new TZDate(instant, tz), pattern);
const dayStart = (day: string, tz: string) => {
  const [y, m, d] = day.split('-').map(Number);
  return new TZDate(y, m - 1, d, 0, 0, 0, tz).getTime();
};
/** Open all day every day over the range: shifts are then the patterns as they stand. */
const always = (from: number, to: number) => [{ start: from, end: to }];
const pattern = (rrule: string, startsOn: string, startTime = '09:00', endTime = '10:00', endsOn: string | null = null): PatternRow => ({ rrule, startsOn, endsOn, startTime, endTime });
const shiftsOf = (patterns: PatternRow[], tz: string, fromDay: string, toDay: string, off: { firstDay: string; lastDay: string }[] = []) => {
  const from = dayStart(fromDay, tz);
  const to = dayStart(toDay, tz);
  return technicianShifts(patterns, off, always(from, to), tz, from, to);
};

describe('working patterns expand as RFC 5545 §3.8.5.3 lists them', () => {
  it('"Every other week on Monday, Wednesday, and Friday until December 24, 1997, starting on Monday, September 1, 1997"', () => {
    const got = shiftsOf([pattern('FREQ=WEEKLY;INTERVAL=2;UNTIL=19971224T000000Z;WKST=SU;BYDAY=MO,WE,FR', '1997-09-01')], NY, '1997-08-01', '1998-01-31');
    // RFC 5545 §3.8.5.3, this example's list of occurrences (25 in all, at 9:00 AM local).
    const rfc = [
      '09-01', '09-03', '09-05', '09-15', '09-17', '09-19', '09-29', '10-01', '10-03', '10-13', '10-15', '10-17', '10-27', '10-29', '10-31',
      '11-10', '11-12', '11-14', '11-24', '11-26', '11-28', '12-08', '12-10', '12-12', '12-22',
    ].map((d) => `1997-${d} 09:00`);
    expect(got.map((s) => local(s.start, NY))).toEqual(rfc);
    // The RFC marks the first ones EDT (UTC−4) and those from 27 October EST (UTC−5): 13:00Z, then 14:00Z.
    expect(new Date(got[0].start).getUTCHours()).toBe(13);
    expect(new Date(got[12].start).getUTCHours()).toBe(14);
  });

  it('"Weekly on Tuesday and Thursday for five weeks" (both of the RFC\'s forms)', () => {
    // RFC 5545 §3.8.5.3: September 2,4,9,11,16,18,23,25,30; October 2 (1997, 9:00 AM EDT).
    const rfc = ['09-02', '09-04', '09-09', '09-11', '09-16', '09-18', '09-23', '09-25', '09-30', '10-02'].map((d) => `1997-${d} 09:00`);
    for (const rule of ['FREQ=WEEKLY;UNTIL=19971007T000000Z;WKST=SU;BYDAY=TU,TH', 'FREQ=WEEKLY;COUNT=10;WKST=SU;BYDAY=TU,TH'])
      expect(shiftsOf([pattern(rule, '1997-09-02')], NY, '1997-08-01', '1997-12-31').map((s) => local(s.start, NY))).toEqual(rfc);
  });

  it('"Every other week on Tuesday and Thursday, for 8 occurrences"', () => {
    // RFC 5545 §3.8.5.3: September 2,4,16,18,30; October 2,14,16 (1997).
    const rfc = ['09-02', '09-04', '09-16', '09-18', '09-30', '10-02', '10-14', '10-16'].map((d) => `1997-${d} 09:00`);
    expect(shiftsOf([pattern('FREQ=WEEKLY;INTERVAL=2;COUNT=8;WKST=SU;BYDAY=TU,TH', '1997-09-02')], NY, '1997-08-01', '1997-12-31').map((s) => local(s.start, NY))).toEqual(rfc);
  });
});

describe('alternate Saturdays count their weeks from the pattern\'s first day', () => {
  it.each(['2026-12-05', '2026-12-07', '2026-12-10'])('starting %s', (startsOn) => {
    const got = shiftsOf([pattern('FREQ=WEEKLY;INTERVAL=2;BYDAY=SA', startsOn, '08:00', '12:30')], LONDON, '2026-11-01', '2027-03-01');
    // Reference: date-fns, every Saturday from startsOn in an even number of Monday-based weeks from it.
    const want = eachDayOfInterval({ start: new Date(`${startsOn}T12:00:00`), end: new Date('2027-02-28T12:00:00') })
      .filter((d) => isSaturday(d) && differenceInCalendarWeeks(d, new Date(`${startsOn}T12:00:00`), { weekStartsOn: 1 }) % 2 === 0)
      .map((d) => `${format(d, 'yyyy-MM-dd')} 08:00`);
    expect(got.map((s) => local(s.start, LONDON))).toEqual(want);
    expect(got.every((s) => s.end - s.start === 4.5 * HOUR)).toBe(true);
  });
});

describe('daylight-saving days in Europe/London', () => {
  // Clocks go back at 02:00 BST on Sunday 25 Oct 2026 and forward at 01:00 GMT on Sunday 28 Mar 2027 (UK law, Summer Time Order).
  it.each([
    ['2026-10-25', 8],
    ['2027-03-28', 7],
  ])('an 08:00–16:30 shift on %s starts 08:00 local and lasts 8.5 h', (day, utcHour) => {
    const got = shiftsOf([pattern('FREQ=DAILY', '2026-10-01', '08:00', '16:30')], LONDON, day, nextDay(day));
    expect(got).toHaveLength(1);
    expect(got[0].end - got[0].start).toBe(8.5 * HOUR);
    // Checked with @date-fns/tz: the instant reads 08:00 and 16:30 on the site's clock.
    expect(local(got[0].start, LONDON)).toBe(`${day} 08:00`);
    expect(local(got[0].end, LONDON)).toBe(`${day} 16:30`);
    expect(new Date(got[0].start).getUTCHours()).toBe(utcHour);
  });

  it('opening hours on those Sundays are 08:00–17:30 local, 9.5 h', () => {
    for (const day of ['2026-10-25', '2027-03-28']) {
      const open = siteOpenIntervals([{ weekday: 7, opensAt: '08:00', closesAt: '17:30' }], LONDON, dayStart(day, LONDON), dayStart(nextDay(day), LONDON));
      expect(open.map((i) => [local(i.start, LONDON), local(i.end, LONDON), i.end - i.start])).toEqual([[`${day} 08:00`, `${day} 17:30`, 9.5 * HOUR]]);
    }
  });
});

describe('opening hours', () => {
  const monSat = [1, 2, 3, 4, 5, 6].map((weekday) => ({ weekday, opensAt: '08:00', closesAt: '17:30' }));
  it('one interval per open day, none on a day without hours', () => {
    const open = siteOpenIntervals(monSat, LONDON, dayStart('2026-12-07', LONDON), dayStart('2026-12-21', LONDON));
    // Reference: date-fns, the days of those two weeks that are not Sundays.
    const want = eachDayOfInterval({ start: new Date(2026, 11, 7), end: new Date(2026, 11, 20) }).filter((d) => d.getDay() !== 0).map((d) => format(d, 'yyyy-MM-dd'));
    expect(open.map((i) => local(i.start, LONDON, 'yyyy-MM-dd'))).toEqual(want);
  });

  it('clipped to the range asked for', () => {
    const from = new TZDate(2026, 11, 7, 10, 15, 0, LONDON).getTime();
    const open = siteOpenIntervals(monSat, LONDON, from, dayStart('2026-12-08', LONDON));
    expect(open).toEqual([{ start: from, end: new TZDate(2026, 11, 7, 17, 30, 0, LONDON).getTime() }]);
  });
});

describe('shifts: time off, opening hours, overlaps', () => {
  it('time off removes exactly its days', () => {
    const got = shiftsOf([pattern('FREQ=DAILY', '2026-12-01', '08:00', '16:30')], LONDON, '2026-12-01', '2027-01-01', [{ firstDay: '2026-12-10', lastDay: '2026-12-14' }, { firstDay: '2026-12-24', lastDay: '2026-12-24' }]);
    // Reference: date-fns eachDayOfInterval for December and for each time off.
    const off = new Set([
      ...eachDayOfInterval({ start: new Date(2026, 11, 10), end: new Date(2026, 11, 14) }),
      ...eachDayOfInterval({ start: new Date(2026, 11, 24), end: new Date(2026, 11, 24) }),
    ].map((d) => format(d, 'yyyy-MM-dd')));
    const want = eachDayOfInterval({ start: new Date(2026, 11, 1), end: new Date(2026, 11, 31) }).map((d) => format(d, 'yyyy-MM-dd')).filter((d) => !off.has(d));
    expect(got.map((s) => local(s.start, LONDON, 'yyyy-MM-dd'))).toEqual(want);
  });

  it('clipped to the opening hours and closed days', () => {
    const from = dayStart('2026-12-12', LONDON); // Saturday
    const to = dayStart('2026-12-14', LONDON);
    const open = siteOpenIntervals([{ weekday: 6, opensAt: '08:00', closesAt: '12:00' }], LONDON, from, to);
    const got = technicianShifts([pattern('FREQ=DAILY', '2026-12-01', '07:00', '16:30')], [], open, LONDON, from, to);
    expect(got.map((s) => [local(s.start, LONDON), local(s.end, LONDON)])).toEqual([['2026-12-12 08:00', '2026-12-12 12:00']]);
  });

  it('two patterns on one day merge into one interval', () => {
    const got = shiftsOf([pattern('FREQ=WEEKLY;BYDAY=MO', '2026-12-07', '08:00', '12:00'), pattern('FREQ=WEEKLY;BYDAY=MO', '2026-12-07', '11:00', '16:30')], LONDON, '2026-12-07', '2026-12-08');
    expect(got.map((s) => [local(s.start, LONDON, 'HH:mm'), local(s.end, LONDON, 'HH:mm')])).toEqual([['08:00', '16:30']]);
  });

  it('an end date stops the pattern after that day', () => {
    const got = shiftsOf([pattern('FREQ=DAILY', '2026-12-01', '08:00', '16:30', '2026-12-03')], LONDON, '2026-11-25', '2026-12-10');
    expect(got.map((s) => local(s.start, LONDON, 'yyyy-MM-dd'))).toEqual(['2026-12-01', '2026-12-02', '2026-12-03']);
  });

  it('is sorted and never overlaps, whatever the patterns (fast-check)', () => {
    const time = fc.integer({ min: 0, max: 95 }).map((q) => `${String(Math.floor(q / 4)).padStart(2, '0')}:${String((q % 4) * 15).padStart(2, '0')}`);
    fc.assert(
      fc.property(fc.array(fc.record({ days: fc.uniqueArray(fc.integer({ min: 1, max: 7 }), { minLength: 1, maxLength: 7 }), other: fc.boolean(), a: time, b: time }), { minLength: 1, maxLength: 4 }), (ps) => {
        const got = shiftsOf(ps.map((p) => pattern(weeklyRule(p.days, p.other), '2026-12-01', p.a < p.b ? p.a : p.b, p.a < p.b ? p.b : p.a)), LONDON, '2026-12-01', '2027-01-15');
        for (let i = 1; i < got.length; i++) expect(got[i].start).toBeGreaterThan(got[i - 1].end);
      }),
      { numRuns: 60 },
    );
  });
});

describe('rules and words', () => {
  it('refuses a rule that is not valid, in words with an example', () => {
    for (const bad of ['', 'FREQ=SOMETIMES', 'FREQ=WEEKLY;BYDAY=XX', 'BYDAY=MO', 'FREQ=WEEKLY;INTERVAL=0', 'FREQ=DAILY;BYHOUR=8', 'DTSTART:20260101\nRRULE:FREQ=DAILY']) {
      const c = checkPatternRule(bad);
      expect(c.ok, bad).toBe(false);
      if (!c.ok) expect(c.message).toMatch(/^That repeat rule is not valid: .+; e\.g\. FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR$/);
    }
    expect(checkPatternRule('rrule:freq=weekly;byday=mo')).toEqual({ ok: true, rule: 'FREQ=WEEKLY;BYDAY=MO' });
  });

  it('says a pattern in words as rrule\'s toText does', () => {
    // rrule's toText names Monday to Friday "every weekday".
    expect(patternInWords('FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', '08:00', '16:30')).toBe('every weekday, 08:00–16:30');
    expect(patternInWords('FREQ=WEEKLY;INTERVAL=2;BYDAY=SA', '08:00', '12:30')).toBe('every 2 weeks on Saturday, 08:00–12:30');
  });

  it('the editor\'s rule is read back the same, and rrulestr agrees on its weekdays (fast-check)', () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 1, max: 7 }), { minLength: 1, maxLength: 7 }), fc.boolean(), (days, other) => {
        const rule = weeklyRule(days, other);
        expect(readWeeklyRule(rule)).toEqual({ weekdays: [...days].sort((a, b) => a - b), everyOtherWeek: other });
        // rrule numbers weekdays 0 = Monday … 6 = Sunday.
        const parsed = rrulestr(`RRULE:${rule}`);
        expect([...(parsed.options.byweekday ?? [])].sort()).toEqual(days.map((d) => d - 1).sort());
        expect(parsed.options.interval).toBe(other ? 2 : 1);
      }),
    );
  });

  it('finds the first day two patterns overlap, or none', () => {
    const weekdays = pattern('FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', '2026-12-01', '08:00', '16:30');
    expect(firstClash(weekdays, pattern('FREQ=WEEKLY;INTERVAL=2;BYDAY=SA', '2026-12-05', '08:00', '12:30'), LONDON)).toBeNull();
    expect(firstClash(weekdays, pattern('FREQ=WEEKLY;BYDAY=FR', '2026-12-01', '16:30', '18:00'), LONDON)).toBeNull();
    expect(firstClash(weekdays, pattern('FREQ=WEEKLY;BYDAY=FR', '2026-12-01', '16:00', '18:00'), LONDON)).toBe('2026-12-04');
    expect(firstClash(weekdays, pattern('FREQ=WEEKLY;BYDAY=FR', '2026-11-01', '12:00', '13:00', '2026-11-30'), LONDON)).toBeNull();
  });

  it('minutes per day split at midnight', () => {
    const from = new TZDate(2026, 11, 7, 22, 0, 0, LONDON).getTime();
    expect(Object.fromEntries(minutesPerDay([{ start: from, end: from + 4 * HOUR }], LONDON))).toEqual({ '2026-12-07': 120, '2026-12-08': 120 });
  });
});

function nextDay(day: string) {
  const d = new Date(`${day}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + 1);
  return d.toISOString().slice(0, 10);
}
