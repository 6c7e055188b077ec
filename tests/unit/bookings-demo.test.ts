import { describe, expect, it } from 'vitest';
import { TZDate } from '@date-fns/tz';
import { addDays, differenceInCalendarDays, format, parseISO } from 'date-fns';
import rrulePkg from 'rrule';
import { buildScenario } from '../../server/demo/scenario';
import { buildBookings } from '../../server/demo/bookings-demo';

const { RRule } = rrulePkg;
const LONDON = 'Europe/London';
// A Thursday in winter, a Friday before the spring change, and a day in summer.
for (const today of ['2026-12-03', '2027-03-26', '2026-06-15']) {
  const s = buildScenario(today);
  const rows = buildBookings(s);
  const siteOf = (name: string) => s.sites.find((x) => x.name === name)!.id;
  const modelOf = (name: string) => s.models.find((m) => m.name === name)!.id;
  const local = (d: Date, pattern: string) => format(new TZDate(d.getTime(), LONDON), pattern);
  // The occurrences of a row, expanded with rrule on floating wall-clock times (its documented use without tzid).
  const starts = (r: (typeof rows)[number]) => {
    if (!r.rrule) return [local(r.startAt, "yyyy-MM-dd'T'HH:mm")];
    const wall = parseISO(local(r.startAt, "yyyy-MM-dd'T'HH:mm:ss"));
    const dtstart = new Date(Date.UTC(wall.getFullYear(), wall.getMonth(), wall.getDate(), wall.getHours(), wall.getMinutes()));
    return new RRule({ ...RRule.parseString(r.rrule), dtstart }).all().map((d) => d.toISOString().slice(0, 16));
  };

  describe(`demo bookings from ${today}`, () => {
    it('fall within the next three weeks at both sites', () => {
      const last = format(addDays(parseISO(today), 21), 'yyyy-MM-dd');
      for (const r of rows) for (const st of starts(r)) {
        expect(st.slice(0, 10) > today, st).toBe(true);
        expect(st.slice(0, 10) <= last, st).toBe(true);
      }
      expect(new Set(rows.map((r) => r.siteId))).toEqual(new Set([siteOf('Quay Street'), siteOf('Airfield')]));
      expect(rows.every((r) => r.endAt > r.startAt && (r.bikeId == null) !== (r.modelId == null))).toBe(true);
    });

    it('book every in-service Pathfinder 250 at Quay Street for a whole weekend', () => {
      const quay = siteOf('Quay Street');
      const pf = modelOf('Pathfinder 250');
      const fleet = s.bikes.filter((b) => b.siteId === quay && b.modelId === pf && b.status === 'in_service');
      const weekend = rows.find((r) => r.siteId === quay && r.modelId === pf)!;
      expect(fleet.length).toBeGreaterThan(1);
      expect(weekend.quantity).toBe(fleet.length);
      // date-fns: Saturday is day 6; the booking runs to the Sunday evening.
      expect(local(weekend.startAt, 'i')).toBe('6');
      expect(local(weekend.endAt, 'i')).toBe('7');
      expect(differenceInCalendarDays(weekend.endAt, weekend.startAt)).toBe(1);
    });

    it('repeat the Airfield Saturday course weekly at 09:00 local time', () => {
      const course = rows.find((r) => r.siteId === siteOf('Airfield') && r.rrule?.includes('BYDAY=SA'))!;
      const times = starts(course);
      expect(times.length).toBe(3);
      for (let i = 1; i < times.length; i++) expect(differenceInCalendarDays(parseISO(times[i]), parseISO(times[i - 1]))).toBe(7);
      expect(times.every((t) => t.endsWith('T09:00'))).toBe(true);
      const have = s.bikes.filter((b) => b.siteId === course.siteId && b.modelId === course.modelId && b.status !== 'retired').length;
      expect(course.quantity).toBeLessThanOrEqual(have);
    });

    it('book bikes at their own site, and no bike twice at once', () => {
      const bikeRows = rows.filter((r) => r.bikeId);
      for (const r of bikeRows) {
        const bike = s.bikes.find((b) => b.id === r.bikeId)!;
        expect(bike.siteId).toBe(r.siteId);
        expect(bike.status).toBe('in_service');
      }
      for (const a of bikeRows) for (const b of bikeRows) if (a !== b && a.bikeId === b.bikeId) expect(a.startAt >= b.endAt || b.startAt >= a.endAt).toBe(true);
    });
  });
}
