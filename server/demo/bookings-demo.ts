import type { Tx } from '../db/client';
import { bookings } from '../db/schema';
import { addDaysIso } from '../../shared/domain/dates';
import { fromWallClock } from '../../shared/domain/bookings';
import type { Scenario } from './scenario';

// Saltmarsh's next three weeks: hires at Quay Street, with the first weekend's Pathfinder 250s all out
// on a group ride, and the Airfield's Saturday course on Strider 125s and Wednesday evening lessons on
// Breeze 125s, both repeating weekly.

export type DemoBooking = Omit<typeof bookings.$inferInsert, 'startAt' | 'endAt'> & { startAt: Date; endAt: Date };

const ZONE = 'Europe/London';
/** The site's wall clock on a day, as an instant. */
const at = (day: string, hhmm: string) => {
  const [y, m, d] = day.split('-').map(Number);
  const [h, mi] = hhmm.split(':').map(Number);
  return new Date(fromWallClock(Date.UTC(y, m - 1, d, h, mi), ZONE));
};
const weekday = (day: string) => new Date(`${day}T00:00:00Z`).getUTCDay();
/** The first day after `day` that falls on `dow` (0 = Sunday … 6 = Saturday). */
const nextDow = (day: string, dow: number) => addDaysIso(day, ((dow - weekday(day) + 7) % 7) || 7);

export function buildBookings(s: Scenario): DemoBooking[] {
  const site = (name: string) => s.sites.find((x) => x.name === name)!.id;
  const model = (name: string) => s.models.find((m) => m.name === name)!.id;
  const person = (name: string) => s.users.find((u) => u.name === name)!.id;
  const bike = (fleet: string) => s.bikes.find((b) => b.fleetNumber === fleet)!;
  const quay = site('Quay Street');
  const airfield = site('Airfield');
  const inService = (siteId: string, modelId: string) => s.bikes.filter((b) => b.siteId === siteId && b.modelId === modelId && b.status === 'in_service');
  const sat1 = nextDow(s.today, 6);
  const sat2 = addDaysIso(sat1, 7);
  const wed1 = nextDow(s.today, 3);
  const cal = person('Cal Brennan');
  const ruth = person('Ruth Ibbot');
  const hire = (fleet: string, from: string, to: string, title: string, fromTime = '09:00', toTime = '17:30'): DemoBooking => ({
    siteId: bike(fleet).siteId, kind: 'hire', bikeId: bike(fleet).id, quantity: 1, startAt: at(from, fromTime), endAt: at(to, toTime), title, source: 'manual', createdBy: cal,
  });
  const pathfinders = inService(quay, model('Pathfinder 250')).length;
  return [
    // Every in-service Pathfinder 250 at Quay Street, the whole first weekend.
    {
      siteId: quay, kind: 'hire', modelId: model('Pathfinder 250'), quantity: pathfinders, startAt: at(sat1, '08:30'), endAt: at(addDaysIso(sat1, 1), '18:00'),
      title: 'Coast road group ride, whole Pathfinder fleet', source: 'manual', createdBy: cal,
    },
    hire('SM-01', sat1, addDaysIso(sat1, 1), 'Weekend coast tour'),
    hire('SM-09', sat1, sat1, 'Day hire'),
    hire('SM-12', sat2, addDaysIso(sat2, 1), 'Weekend hire'),
    hire('SM-22', addDaysIso(sat2, 2), addDaysIso(sat2, 6), 'Week-long touring hire'),
    {
      siteId: quay, kind: 'hire', modelId: model('Ridgeback 400'), quantity: 2, startAt: at(addDaysIso(sat2, 7), '09:00'), endAt: at(addDaysIso(sat2, 7), '17:30'),
      title: 'Two Ridgebacks for a club day', source: 'manual', createdBy: cal,
    },
    // The Airfield's courses repeat weekly from the first Saturday and Wednesday ahead, three times each.
    {
      siteId: airfield, kind: 'lesson', modelId: model('Strider 125'), quantity: 4, startAt: at(sat1, '09:00'), endAt: at(sat1, '12:30'),
      rrule: 'FREQ=WEEKLY;BYDAY=SA;COUNT=3', title: 'Saturday morning beginners’ course', source: 'manual', createdBy: ruth,
    },
    {
      siteId: airfield, kind: 'lesson', modelId: model('Breeze 125'), quantity: 2, startAt: at(wed1, '18:00'), endAt: at(wed1, '20:00'),
      rrule: 'FREQ=WEEKLY;BYDAY=WE;COUNT=3', title: 'Wednesday evening scooter lessons', source: 'manual', createdBy: ruth,
    },
    hire('SM-23', addDaysIso(wed1, 1), addDaysIso(wed1, 1), 'Off-road taster day'),
  ];
}

export async function seedBookings(tx: Tx, s: Scenario) {
  await tx.insert(bookings).values(buildBookings(s));
}
