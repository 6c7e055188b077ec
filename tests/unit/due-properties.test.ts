import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import fc from 'fast-check';
import { addDays, addMonths, differenceInCalendarDays, format } from 'date-fns';
import { TZDate } from '@date-fns/tz';
import * as rruleModule from 'rrule';
import { addDaysIso, addMonthsIso, compareIso, daysBetween, todayInZone } from '../../shared/domain/dates';
import { computeDue, DUE_STATUS_RANK, nextRuleDate, type ServiceInterval } from '../../shared/domain/due';

type RruleModule = typeof rruleModule;
const { RRule } = (Reflect.get(rruleModule, 'default') as RruleModule | undefined) ?? rruleModule;

const utc = (iso: string) => {
  const [y, m, d] = iso.split('-').map(Number);
  return new TZDate(y, m - 1, d, 'UTC');
};
const ymd = (d: Date) => format(d, 'yyyy-MM-dd');

const anyDate = (from = '1900-01-01', days = 365 * 200) => fc.integer({ min: 0, max: days }).map((n) => addDaysIso(from, n));
const recentDate = anyDate('2020-01-01', 365 * 6);

// Runs `fn` with the process in another time zone; Node re-reads process.env.TZ when it changes.
function inZone<T>(zone: string | undefined, fn: () => T): T {
  const saved = process.env.TZ;
  try {
    if (zone === undefined) delete process.env.TZ;
    else process.env.TZ = zone;
    return fn();
  } finally {
    if (saved === undefined) delete process.env.TZ;
    else process.env.TZ = saved;
  }
}

describe('calendar arithmetic against date-fns (property)', () => {
  // date-fns works through local Date objects, so in a zone that skipped a whole day
  // (Kiritimati left out 31 Dec 1994) its own answers shift; the reference runs in UTC.
  let saved: string | undefined;
  beforeAll(() => {
    saved = process.env.TZ;
    process.env.TZ = 'UTC';
  });
  afterAll(() => {
    if (saved === undefined) delete process.env.TZ;
    else process.env.TZ = saved;
  });

  it('addMonthsIso equals date-fns addMonths for any date and month count', () => {
    // Reference: date-fns addMonths (end-of-month clamping, leap years).
    fc.assert(
      fc.property(anyDate(), fc.integer({ min: -240, max: 240 }), (date, n) => {
        expect(addMonthsIso(date, n)).toBe(ymd(addMonths(utc(date), n)));
      }),
      { numRuns: 1000 },
    );
  });

  it('addDaysIso and daysBetween equal date-fns addDays and differenceInCalendarDays', () => {
    // Reference: date-fns addDays, differenceInCalendarDays.
    fc.assert(
      fc.property(anyDate(), anyDate(), fc.integer({ min: -20_000, max: 20_000 }), (a, b, n) => {
        expect(addDaysIso(a, n)).toBe(ymd(addDays(utc(a), n)));
        expect(daysBetween(a, b)).toBe(differenceInCalendarDays(utc(b), utc(a)));
      }),
      { numRuns: 1000 },
    );
  });

  it('nextRuleDate equals the rrule package’s first occurrence after the baseline', () => {
    // Reference: rrule after(), with DTSTART = baseline at UTC midnight.
    const rules = ['FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1', 'FREQ=MONTHLY;BYMONTHDAY=-1', 'FREQ=WEEKLY;INTERVAL=2;BYDAY=MO', 'FREQ=MONTHLY;INTERVAL=6'];
    fc.assert(
      fc.property(recentDate, fc.constantFrom(...rules), (date, rule) => {
        const start = utc(date);
        const direct = new RRule({ ...RRule.parseString(rule), dtstart: new Date(start.getTime()) }).after(new Date(start.getTime()), false);
        expect(nextRuleDate(rule, date)).toBe(direct ? direct.toISOString().slice(0, 10) : null);
      }),
      { numRuns: 300 },
    );
  });
});

describe('independence from the server time zone', () => {
  it('gives the same answers whatever time zone the server runs in', () => {
    const samples: [string, number][] = [['2024-08-31', 6], ['2025-03-30', 1], ['2024-10-27', -7], ['2023-12-31', 2], ['1994-12-30', 1]];
    const instants = ['2025-03-30T00:30:00Z', '2025-10-25T23:59:59Z', '2025-06-30T12:00:00Z'].map((t) => new Date(t));
    const run = () => [
      ...samples.map(([d, n]) => [addMonthsIso(d, n), addDaysIso(d, n), daysBetween(d, '2025-03-31')]),
      ...instants.map((at) => [todayInZone('Europe/London', at), todayInZone('Pacific/Auckland', at), todayInZone('America/Los_Angeles', at)]),
    ];
    const expected = inZone('UTC', run);
    // UTC+14, UTC−3:30 and UTC−11 in January (IANA time zone database): proves the zone really changed.
    for (const [zone, offset] of [['Pacific/Kiritimati', -840], ['America/St_Johns', 210], ['Pacific/Pago_Pago', 660]] as const) {
      inZone(zone, () => {
        expect(new Date(Date.UTC(2025, 0, 15)).getTimezoneOffset()).toBe(offset);
        expect(run()).toEqual(expected);
      });
    }
  });

  it('keeps a day that a local clock skipped', () => {
    // Gregorian calendar: 31 Dec 1994 exists, though Kiritimati's clocks jumped over it (IANA tz database).
    inZone('Pacific/Kiritimati', () => {
      expect(addDaysIso('1994-12-30', 1)).toBe('1994-12-31');
      expect(daysBetween('1994-12-30', '1995-01-01')).toBe(2);
      expect(addMonthsIso('1994-11-30', 1)).toBe('1994-12-30');
      expect(addDaysIso('1994-12-31', 1)).toBe('1995-01-01');
    });
  });
});

// Scenario generators: a bike with a baseline, some check-ins and an interval.
const reading = (base: string) =>
  fc.record({ offset: fc.integer({ min: -30, max: 900 }), km: fc.integer({ min: 0, max: 80_000 }) }).map(({ offset, km }) => ({
    date: addDaysIso(base, offset),
    odometerKm: km,
  }));
const kmInterval: fc.Arbitrary<ServiceInterval> = fc.record({
  everyKm: fc.integer({ min: 300, max: 30_000 }),
  everyMonths: fc.option(fc.integer({ min: 1, max: 36 }), { nil: undefined }),
  firstAtKm: fc.option(fc.integer({ min: 0, max: 2_000 }), { nil: undefined }),
});
const anyInterval: fc.Arbitrary<ServiceInterval> = fc.record({
  everyKm: fc.option(fc.integer({ min: 300, max: 30_000 }), { nil: undefined }),
  everyMonths: fc.option(fc.integer({ min: 1, max: 36 }), { nil: undefined }),
  firstAtKm: fc.option(fc.integer({ min: 0, max: 2_000 }), { nil: undefined }),
  rrule: fc.option(fc.constantFrom('FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1', 'FREQ=MONTHLY;INTERVAL=3'), { nil: undefined }),
});
const scenario = (interval: fc.Arbitrary<ServiceInterval>) =>
  fc
    .record({ base: recentDate, baseKm: fc.integer({ min: 0, max: 40_000 }), done: fc.boolean(), todayOffset: fc.integer({ min: 0, max: 900 }) })
    .chain(({ base, baseKm, done, todayOffset }) =>
      fc.record({
        interval,
        base: fc.constant({ date: base, odometerKm: baseKm }),
        done: fc.constant(done),
        readings: fc.array(reading(base), { maxLength: 12 }),
        today: fc.constant(addDaysIso(base, todayOffset)),
      }),
    )
    .map(({ interval, base, done, readings, today }) => ({
      interval,
      inService: done ? { date: addDaysIso(base.date, -400), odometerKm: Math.max(0, base.odometerKm - 9_000) } : base,
      lastDone: done ? base : undefined,
      readings,
      today,
    }));

describe('computeDue (property)', () => {
  it('a higher odometer never makes an item less due', () => {
    // Whichever-comes-first (factory maintenance charts; common practice): more km can only bring the km limit closer.
    fc.assert(
      fc.property(scenario(kmInterval), fc.integer({ min: 0, max: 5_000 }), fc.integer({ min: 0, max: 900 }), (s, extra, back) => {
        const before = computeDue(s);
        const higher = { date: addDaysIso(s.today, -Math.min(back, daysBetween(s.inService.date, s.today))), odometerKm: before.currentKm + extra };
        const after = computeDue({ ...s, readings: [...s.readings, higher] });
        expect(after.dueAtKm).toBe(before.dueAtKm);
        expect(after.remainingKm!).toBeLessThanOrEqual(before.remainingKm!);
        expect(after.currentKm).toBeGreaterThanOrEqual(before.currentKm);
      }),
      { numRuns: 400 },
    );
  });

  it('an item overdue by km stays overdue until it is done', () => {
    // An odometer never winds back (common practice), so a km limit once reached stays reached.
    fc.assert(
      fc.property(
        scenario(kmInterval),
        fc.integer({ min: 0, max: 3_000 }),
        fc.array(fc.tuple(fc.nat(), fc.integer({ min: 0, max: 80_000 })), { maxLength: 6 }),
        fc.integer({ min: 0, max: 1_500 }),
        (s, overshoot, later, advance) => {
          const first = computeDue(s);
          const reached = { date: s.today, odometerKm: first.dueAtKm! + overshoot };
          const overdue = computeDue({ ...s, readings: [...s.readings, reached] });
          expect(overdue.status).toBe('overdue');
          const today = addDaysIso(s.today, advance);
          // Later check-ins, any km (even a mistyped low one), dated up to the new today.
          const laterReadings = later.map(([day, km]) => ({ date: addDaysIso(s.today, day % (advance + 1)), odometerKm: km }));
          const still = computeDue({ ...s, today, readings: [...s.readings, reached, ...laterReadings] });
          expect(still.status).toBe('overdue');
          expect(still.trigger).not.toBeNull();
        },
      ),
      { numRuns: 300 },
    );
  });

  it('for a calendar-only item, status never improves as today advances', () => {
    // Calendar limits are fixed dates: time only brings them closer (RFC 5545 dates; date-fns month arithmetic).
    const calendarOnly: fc.Arbitrary<ServiceInterval> = fc.oneof(
      fc.record({ everyMonths: fc.integer({ min: 1, max: 36 }) }),
      fc.record({ rrule: fc.constantFrom('FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1', 'FREQ=MONTHLY;BYMONTHDAY=-1', 'FREQ=WEEKLY;INTERVAL=2;BYDAY=MO') }),
      fc.record({ everyMonths: fc.integer({ min: 1, max: 36 }), rrule: fc.constant('FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1') }),
    );
    fc.assert(
      fc.property(scenario(calendarOnly), fc.array(fc.integer({ min: 1, max: 60 }), { minLength: 1, maxLength: 12 }), (s, steps) => {
        let today = s.today;
        let rank = DUE_STATUS_RANK[computeDue(s).status];
        for (const step of steps) {
          today = addDaysIso(today, step);
          const next = DUE_STATUS_RANK[computeDue({ ...s, today }).status];
          expect(next).toBeGreaterThanOrEqual(rank);
          rank = next;
        }
      }),
      { numRuns: 300 },
    );
  });

  it('the due date is never later than either limit alone, and is one of them', () => {
    // "Whichever comes first" (factory maintenance charts; common practice).
    fc.assert(
      fc.property(scenario(anyInterval), (s) => {
        const due = computeDue(s);
        if (due.dueByDate) expect(compareIso(due.dueDate!, due.dueByDate)).toBeLessThanOrEqual(0);
        if (due.projectedDateForKm) expect(compareIso(due.dueDate!, due.projectedDateForKm)).toBeLessThanOrEqual(0);
        if (!due.dueByDate && !due.projectedDateForKm) expect(due.dueDate).toBeNull();
        else expect([due.dueByDate, due.projectedDateForKm]).toContain(due.dueDate);
        expect(due.remainingDays).toBe(due.dueDate ? daysBetween(s.today, due.dueDate) : null);
        expect(due.currentKm).toBeGreaterThanOrEqual(due.baseline.odometerKm);
      }),
      { numRuns: 500 },
    );
  });
});
