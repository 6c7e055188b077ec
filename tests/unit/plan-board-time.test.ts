import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { sameTimeOnDay, siteDay, siteInstant, siteTime } from '../../src/lib/site-time';

// The reference for every check: the platform's own Intl.DateTimeFormat over the IANA time zone database,
// which is independent of @date-fns/tz's arithmetic.
function wallClock(iso: string, timeZone: string) {
  const p = Object.fromEntries(
    new Intl.DateTimeFormat('en-GB', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23' })
      .formatToParts(new Date(iso))
      .map((x) => [x.type, x.value]),
  );
  return { day: `${p.year}-${p.month}-${p.day}`, time: `${p.hour}:${p.minute}` };
}

describe('plan times on the site’s clock', () => {
  it('keeps 09:00 on the clock when a visit moves across the end of summer time', () => {
    // UK summer time ends on the last Sunday of October (25 Oct 2026): 09:00 is 08:00Z before, 09:00Z after.
    const friday = '2026-10-23T08:00:00.000Z';
    expect(wallClock(friday, 'Europe/London')).toEqual({ day: '2026-10-23', time: '09:00' });
    const monday = sameTimeOnDay(friday, '2026-10-26', 'Europe/London');
    expect(monday).toBe('2026-10-26T09:00:00.000Z');
    expect(wallClock(monday, 'Europe/London')).toEqual({ day: '2026-10-26', time: '09:00' });
  });

  it('reads the site’s day, not the device’s, near midnight', () => {
    // 23:30Z on 7 Dec is already 8 Dec in Auckland (UTC+13 in its summer).
    expect(siteDay('2026-12-07T23:30:00.000Z', 'Pacific/Auckland')).toBe('2026-12-08');
    expect(siteTime('2026-12-07T23:30:00.000Z', 'Pacific/Auckland')).toBe('12:30');
  });

  it('agrees with Intl for any instant and day, in zones with and without summer time', () => {
    const zones = ['Europe/London', 'America/New_York', 'Pacific/Auckland', 'Asia/Kolkata'];
    fc.assert(
      fc.property(
        fc.integer({ min: Date.UTC(2026, 0, 1), max: Date.UTC(2027, 11, 31) }).map((ms) => new Date(Math.floor(ms / 60_000) * 60_000).toISOString()),
        fc.integer({ min: 0, max: 700 }),
        fc.constantFrom(...zones),
        (instant, offset, tz) => {
          const day = new Date(Date.UTC(2026, 0, 1 + offset)).toISOString().slice(0, 10);
          const moved = sameTimeOnDay(instant, day, tz);
          const want = wallClock(instant, tz).time;
          const got = wallClock(moved, tz);
          expect(got.day).toBe(day);
          // A clock time that does not exist that day (the spring gap) lands just after it.
          if (got.time !== want) expect(got.time > want).toBe(true);
        },
      ),
      { numRuns: 500 },
    );
  });

  it('refuses a day or time it cannot read, saying the form it wants', () => {
    expect(() => siteInstant('8/12/2026', '09:00', 'Europe/London')).toThrow('use YYYY-MM-DD');
    expect(() => siteInstant('2026-12-08', '9am', 'Europe/London')).toThrow('use HH:mm');
  });
});
