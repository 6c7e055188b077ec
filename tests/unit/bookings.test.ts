import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import rrulePkg from 'rrule';
import {
  bookingOccurrences, checkRule, expandInterval, parseBookingTime, quantityInText, ruleText, timesProblem, type BookingRow,
} from '../../shared/domain/bookings';

const { RRule } = rrulePkg;
const NY = 'America/New_York';
const LONDON = 'Europe/London';
const HOUR = 3_600_000;
const at = (y: number, m: number, d: number, h: number, tz: string, min = 0) => new TZDate(y, m - 1, d, h, min, 0, tz).getTime();
const far = { from: Date.UTC(1990, 0, 1), to: Date.UTC(2000, 0, 1) };
// The RFC's examples start 1997-09-02 09:00 in America/New_York and last one hour here.
const rfc = (rule: string, y = 1997, m = 9, d = 2) =>
  expandInterval({ start: at(y, m, d, 9, NY), end: at(y, m, d, 10, NY), rule, timeZone: NY, ...far }).map((o) => o.start);
const nineAm = (year: number, days: [number, number][]) => days.map(([m, d]) => at(year, m, d, 9, NY));

describe('repeat rules expand as RFC 5545 §3.8.5.3 lists them (DTSTART;TZID=America/New_York)', () => {
  it('"Weekly for 10 occurrences": 09:00 EDT, then 09:00 EST after the change', () => {
    // RFC 5545 §3.8.5.3: September 2,9,16,23,30; October 7,14,21 (EDT); October 28; November 4 (EST).
    const got = rfc('FREQ=WEEKLY;COUNT=10');
    expect(got).toEqual(nineAm(1997, [[9, 2], [9, 9], [9, 16], [9, 23], [9, 30], [10, 7], [10, 14], [10, 21], [10, 28], [11, 4]]));
    // EDT is UTC−4 and EST is UTC−5 (US time zone practice): the wall clock stays at 9:00.
    expect(new Date(got[0]).getUTCHours()).toBe(13);
    expect(new Date(got[9]).getUTCHours()).toBe(14);
  });

  it('"Every other week on Tuesday and Thursday, for 8 occurrences"', () => {
    // RFC 5545 §3.8.5.3: September 2,4,16,18,30; October 2,14,16 (1997, 9:00 AM EDT).
    expect(rfc('FREQ=WEEKLY;INTERVAL=2;COUNT=8;WKST=SU;BYDAY=TU,TH')).toEqual(nineAm(1997, [[9, 2], [9, 4], [9, 16], [9, 18], [9, 30], [10, 2], [10, 14], [10, 16]]));
  });

  it('"Weekly until December 24, 1997" with a UTC UNTIL', () => {
    // RFC 5545 §3.8.5.3: September 2 … December 23 every Tuesday; December 23 09:00 EST is before 24 Dec 00:00Z.
    const tuesdays: [number, number][] = [[9, 2], [9, 9], [9, 16], [9, 23], [9, 30], [10, 7], [10, 14], [10, 21], [10, 28], [11, 4], [11, 11], [11, 18], [11, 25], [12, 2], [12, 9], [12, 16], [12, 23]];
    expect(rfc('FREQ=WEEKLY;UNTIL=19971224T000000Z')).toEqual(nineAm(1997, tuesdays));
  });

  it('"Monthly on the first Friday for 10 occurrences"', () => {
    // RFC 5545 §3.8.5.3: 1997 September 5; October 3; November 7; December 5; 1998 January 2; February 6; March 6; April 3; May 1; June 5.
    const want = [...nineAm(1997, [[9, 5], [10, 3], [11, 7], [12, 5]]), ...nineAm(1998, [[1, 2], [2, 6], [3, 6], [4, 3], [5, 1], [6, 5]])];
    expect(rfc('FREQ=MONTHLY;COUNT=10;BYDAY=1FR', 1997, 9, 5)).toEqual(want);
  });

  it('"Daily for 10 occurrences" and only those inside the asked range', () => {
    // RFC 5545 §3.8.5.3: September 2–11, 1997.
    expect(rfc('FREQ=DAILY;COUNT=10')).toEqual(nineAm(1997, Array.from({ length: 10 }, (_, i) => [9, 2 + i] as [number, number])));
    const some = expandInterval({ start: at(1997, 9, 2, 9, NY), end: at(1997, 9, 2, 10, NY), rule: 'FREQ=DAILY;COUNT=10', timeZone: NY, from: at(1997, 9, 5, 9, NY, 30), to: at(1997, 9, 7, 9, NY) });
    // Half-open [from, to): the 5 Sep lesson (09:00–10:00) overlaps 09:30; the 7 Sep one starts at `to` and is out.
    expect(some.map((o) => o.start)).toEqual(nineAm(1997, [[9, 5], [9, 6]]));
  });
});

describe('a weekly lesson in Europe/London across the October change', () => {
  const row: BookingRow = {
    id: 'b1', siteId: 'airfield', kind: 'lesson', bikeId: null, modelId: 'm', quantity: 4, title: 'CBT',
    startAt: new Date(at(2026, 10, 10, 9, LONDON)), endAt: new Date(at(2026, 10, 10, 12, LONDON)).toISOString(), rrule: 'FREQ=WEEKLY;BYDAY=SA;COUNT=6',
  };
  const occ = bookingOccurrences([row], { airfield: LONDON }, Date.UTC(2026, 9, 1), Date.UTC(2026, 11, 31));

  it('stays at 09:00–12:00 local time (checked with @date-fns/tz)', () => {
    expect(occ).toHaveLength(6);
    for (const o of occ) {
      expect(format(new TZDate(o.start, LONDON), 'EEE HH:mm')).toBe('Sat 09:00');
      expect(format(new TZDate(o.end, LONDON), 'HH:mm')).toBe('12:00');
    }
    // BST is UTC+1 until the last Sunday of October, then GMT (UK Summer Time Order): 08:00Z, then 09:00Z.
    expect(new Date(occ[2].start).getUTCHours()).toBe(8);
    expect(new Date(occ[3].start).getUTCHours()).toBe(9);
    expect(occ[0]).toMatchObject({ bookingId: 'b1', siteId: 'airfield', quantity: 4, modelId: 'm', kind: 'lesson', title: 'CBT' });
  });

  it('matches rrule run in UTC where no change falls (rrule 2.8 between)', () => {
    const inWinter = bookingOccurrences([{ ...row, startAt: new Date(Date.UTC(2026, 10, 7, 9)), endAt: new Date(Date.UTC(2026, 10, 7, 12)) }], { airfield: LONDON }, 0, Date.UTC(2027, 5, 1));
    const ref = new RRule({ ...RRule.parseString('FREQ=WEEKLY;BYDAY=SA;COUNT=6'), dtstart: new Date(Date.UTC(2026, 10, 7, 9)) }).all().map((d) => d.getTime());
    expect(inWinter.map((o) => o.start)).toEqual(ref);
  });

  it('a booking without a rule is one occurrence, kept when it overlaps the range (property, fast-check)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1000 }), fc.integer({ min: 1, max: 100 }), fc.integer({ min: 0, max: 1000 }), fc.integer({ min: 1, max: 100 }), (s, len, f, span) => {
        const b = { ...row, rrule: null, startAt: new Date(s * HOUR), endAt: new Date((s + len) * HOUR) };
        const got = bookingOccurrences([b], {}, f * HOUR, (f + span) * HOUR);
        // Half-open intervals overlap when each starts before the other ends (Allen's interval algebra).
        expect(got.length).toBe(s < f + span && s + len > f ? 1 : 0);
      }),
    );
  });
});

describe('rules, times and counts as people write them', () => {
  it('refuses rules that are not RFC 5545 RRULEs, in words', () => {
    for (const bad of ['', 'FREQ=HOURLY', 'BYDAY=MO', 'FREQ=WEEKLY;BYDAY=XX', 'FREQ=WEEKLY;COUNT=abc', 'FREQ=WEEKLY;INTERVAL=0', 'DTSTART:20260101T090000Z\nRRULE:FREQ=DAILY', 'FREQ=WEEKLY;COUNT=3;UNTIL=20270101', 'FREQ=WEEKLY;FOO=1']) {
      const c = checkRule(bad);
      expect(c.ok, bad).toBe(false);
      if (!c.ok) expect(c.message).toMatch(/RRULE/);
    }
    expect(checkRule('rrule:freq=weekly;byday=sa')).toEqual({ ok: true, rule: 'FREQ=WEEKLY;BYDAY=SA' });
    // rrule's toText gives the plain-words form.
    expect(ruleText('FREQ=WEEKLY;BYDAY=SA')).toBe(new RRule({ freq: RRule.WEEKLY, byweekday: [RRule.SA] }).toText());
  });

  it('reads local site times and ISO 8601 times with an offset', () => {
    // Checked against @date-fns/tz: 09:00 in London in December is GMT, in July BST (UTC+1).
    expect(parseBookingTime('2026-12-12 09:00', LONDON)).toBe(new TZDate(2026, 11, 12, 9, 0, 0, LONDON).getTime());
    expect(parseBookingTime('2026-07-01T09:00', LONDON)).toBe(Date.UTC(2026, 6, 1, 8));
    expect(parseBookingTime('2026-07-01T09:00:00+02:00', LONDON)).toBe(Date.UTC(2026, 6, 1, 7));
    expect(parseBookingTime('2026-07-01T09:00:00Z', LONDON)).toBe(Date.UTC(2026, 6, 1, 9));
    for (const bad of ['2026-02-30 09:00', '2026-12-12 25:00', '12/12/2026 09:00', 'tomorrow', '2026-12-12']) expect(parseBookingTime(bad, LONDON), bad).toBeNull();
  });

  it('refuses an end before the start and a booking longer than 60 days', () => {
    expect(timesProblem(10, 5)).toMatch(/not after the start/);
    expect(timesProblem(0, 61 * 86_400_000)).toMatch(/at most 60 days/);
    expect(timesProblem(0, 60 * 86_400_000)).toBeNull();
  });

  it('finds a bike count written as ×3 or x3', () => {
    expect(quantityInText('Breeze 125 ×3 group ride')).toBe(3);
    expect(quantityInText('Lesson block x4')).toBe(4);
    expect(quantityInText('X 2 Striders')).toBe(2);
    expect(quantityInText('box3 of spares')).toBeNull();
    expect(quantityInText('SM-07 hire')).toBeNull();
  });
});
