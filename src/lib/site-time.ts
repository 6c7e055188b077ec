import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';

// Visits are planned on a site's wall clock, whatever the device's own time zone: every day and time
// the planning screens show or send goes through these.

const zoned = (instant: string | number, timeZone: string) => {
  const d = new TZDate(typeof instant === 'string' ? Date.parse(instant) : instant, timeZone);
  if (Number.isNaN(d.getTime())) throw new Error(`Cannot read the time "${String(instant)}" in ${timeZone}.`);
  return d;
};

/** An instant on the site's clock in a date-fns pattern, e.g. 'EEE d MMM HH:mm' → "Tue 8 Dec 09:00". */
export const formatAtSite = (instant: string | number, timeZone: string, pattern: string) => format(zoned(instant, timeZone), pattern);

/** The site's calendar day (YYYY-MM-DD) at an instant. */
export const siteDay = (instant: string | number, timeZone: string) => formatAtSite(instant, timeZone, 'yyyy-MM-dd');

/** The site's time of day (HH:mm) at an instant. */
export const siteTime = (instant: string | number, timeZone: string) => formatAtSite(instant, timeZone, 'HH:mm');

/** The instant a wall-clock day and time at the site names, as an ISO string in UTC. */
export function siteInstant(day: string, time: string, timeZone: string): string {
  const d = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day);
  const t = /^(\d{2}):(\d{2})$/.exec(time);
  if (!d) throw new Error(`"${day}" is not a day: use YYYY-MM-DD.`);
  if (!t) throw new Error(`"${time}" is not a time of day: use HH:mm, e.g. 09:00.`);
  const at = new TZDate(Number(d[1]), Number(d[2]) - 1, Number(d[3]), Number(t[1]), Number(t[2]), 0, 0, timeZone);
  return new Date(at.getTime()).toISOString();
}

/** The same wall-clock time of day as `instant`, on another day at the site (a summer-time change moves the UTC hour, not the clock). */
export const sameTimeOnDay = (instant: string, day: string, timeZone: string) => siteInstant(day, siteTime(instant, timeZone), timeZone);

/** A day name as people read it: "Tue 8 Dec". */
export function formatDay(day: string) {
  const [y, m, d] = day.split('-').map(Number);
  return format(new Date(y, m - 1, d), 'EEE d MMM');
}
