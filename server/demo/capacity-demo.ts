import type { Tx } from '../db/client';
import { bays, siteHours, timeOff, workPatterns } from '../db/schema';
import { addDaysIso } from '../../shared/domain/dates';
import { isoWeekday, weeklyRule } from '../../shared/domain/shifts';
import type { Scenario } from './scenario';

// The Saltmarsh workshops: Quay Street has two bays open Monday to Saturday 08:00–17:30, the Airfield
// one bay 08:00–16:30. Tomasz works weekdays at Quay Street and every other Saturday morning; Priya
// works Tuesday to Saturday at the Airfield and has a day off in the coming week.

export interface DemoCapacity {
  bays: (typeof bays.$inferInsert)[];
  siteHours: (typeof siteHours.$inferInsert)[];
  workPatterns: (typeof workPatterns.$inferInsert)[];
  timeOff: (typeof timeOff.$inferInsert)[];
}

const MON_SAT = [1, 2, 3, 4, 5, 6];
const HOURS: Record<string, { opensAt: string; closesAt: string }> = {
  'Quay Street': { opensAt: '08:00', closesAt: '17:30' },
  Airfield: { opensAt: '08:00', closesAt: '16:30' },
};

/** The Monday on or before a day. */
const mondayOf = (day: string) => addDaysIso(day, 1 - isoWeekday(day));

export function buildCapacity(s: Scenario): DemoCapacity {
  const site = (name: string) => s.sites.find((x) => x.name === name)!;
  const person = (name: string) => s.users.find((u) => u.name === name)!;
  const quay = site('Quay Street');
  const airfield = site('Airfield');
  const tomasz = person('Tomasz Reed');
  const priya = person('Priya Vale');
  // Patterns began four weeks ago, on a Monday; Tomasz's first Saturday is that week's.
  const since = addDaysIso(mondayOf(s.today), -28);
  // Priya's day off: the first Thursday after today (always within the coming week).
  const offDay = addDaysIso(s.today, ((4 - isoWeekday(s.today) + 7) % 7) || 7);
  return {
    bays: s.sites.flatMap((x) => Array.from({ length: x.bays ?? 1 }, (_, i) => ({ siteId: x.id!, name: `Bay ${i + 1}`, position: i + 1 }))),
    siteHours: s.sites.flatMap((x) => MON_SAT.map((weekday) => ({ siteId: x.id!, weekday, ...HOURS[x.name] }))),
    workPatterns: [
      { userId: tomasz.id, siteId: quay.id!, rrule: weeklyRule([1, 2, 3, 4, 5], false), startsOn: since, startTime: '08:00', endTime: '16:30', label: 'Weekdays' },
      { userId: tomasz.id, siteId: quay.id!, rrule: weeklyRule([6], true), startsOn: addDaysIso(since, 5), startTime: '08:00', endTime: '12:30', label: 'Alternate Saturdays' },
      { userId: priya.id, siteId: airfield.id!, rrule: weeklyRule([2, 3, 4, 5, 6], false), startsOn: since, startTime: '08:00', endTime: '16:30', label: 'Tuesday to Saturday' },
    ],
    timeOff: [{ userId: priya.id, firstDay: offDay, lastDay: offDay, reason: 'Day off' }],
  };
}

/** Loads the demo capacity inside the demo seed's transaction. */
export async function seedCapacity(tx: Tx, s: Scenario) {
  const c = buildCapacity(s);
  await tx.insert(bays).values(c.bays);
  await tx.insert(siteHours).values(c.siteHours);
  await tx.insert(workPatterns).values(c.workPatterns);
  await tx.insert(timeOff).values(c.timeOff);
}
