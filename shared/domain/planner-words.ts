// How the planner writes days, times and bookings in words, on the wall clock of the site.
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';
import type { Interval, ModelDemand, PlanBikeBooking } from './plan-types';

export const dayWords = (ms: number, zone: string) => format(new TZDate(ms, zone), 'EEE d MMM');
export const timeWords = (ms: number, zone: string) => format(new TZDate(ms, zone), 'HH:mm');
export const dayTimeWords = (ms: number, zone: string) => format(new TZDate(ms, zone), 'EEE d MMM HH:mm');
export const isoDayOf = (ms: number, zone: string) => format(new TZDate(ms, zone), 'yyyy-MM-dd');

/** A calendar day ("YYYY-MM-DD") as "Thu 10 Dec". */
export function dateWords(date: string): string {
  const [y, m, d] = date.split('-').map(Number);
  return format(new TZDate(Date.UTC(y, m - 1, d, 12), 'UTC'), 'EEE d MMM');
}

/** "Sat 12 Dec 09:00–17:00" within a day, "Sat 12 Dec 09:00 – Sun 13 Dec 17:00" across days. */
export function spanWords(i: Interval, zone: string): string {
  const lastMinute = i.end - 1;
  if (isoDayOf(i.start, zone) === isoDayOf(lastMinute, zone)) return `${dayTimeWords(i.start, zone)}–${timeWords(i.end, zone)}`;
  return `${dayTimeWords(i.start, zone)} – ${dayTimeWords(i.end, zone)}`;
}

/** "09:00–10:30", with the day when it is not `sameDayAs`'s day. */
export function timesWords(i: Interval, zone: string, sameDayAs: number): string {
  if (isoDayOf(i.start, zone) === isoDayOf(sameDayAs, zone) && isoDayOf(i.end - 1, zone) === isoDayOf(sameDayAs, zone)) {
    return `${timeWords(i.start, zone)}–${timeWords(i.end, zone)}`;
  }
  return spanWords(i, zone);
}

/** "on hire 'Family weekend'" or "booked for lesson 'Beginners'". */
export function bookingWords(b: Pick<PlanBikeBooking | ModelDemand, 'kind' | 'title'>): string {
  return b.kind === 'hire' ? `on hire '${b.title}'` : `booked for lesson '${b.title}'`;
}

export const kindWords = (b: Pick<ModelDemand, 'kind' | 'title'>) => `${b.kind} '${b.title}'`;

/** Whole hours when round, else one decimal: "6 h", "1.5 h". */
export function hoursWords(minutes: number): string {
  const h = minutes / 60;
  return `${Number.isInteger(h) ? h : h.toFixed(1)} h`;
}

/** "A, B and C". */
export function listWords(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
