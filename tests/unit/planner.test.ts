import { describe, expect, it } from 'vitest';
import rrulePkg from 'rrule';
import { format } from 'date-fns';
import { TZDate } from '@date-fns/tz';
import { checkPlacement, dueWithinHorizon, groupIntoVisits, planWorkshop } from '../../shared/domain/planner';
import type { FixedVisit, ModelDemand } from '../../shared/domain/plan-types';
import { WEEK, ZONE, at, bike, brokenRules, scene, shifts, task, weekdays } from './planner-scene';

const { RRule } = rrulePkg;
const HOUR = 3_600_000;
// Source for every day name below: the calendar as date-fns formats it (Mon 7 Dec 2026 … Sun 13 Dec 2026).
const dayName = (ms: number) => format(new TZDate(ms, ZONE), 'EEE d MMM');

describe('groupIntoVisits', () => {
  it('brings items due within 14 days of the earliest into one visit, and starts the next visit after that', () => {
    const a = task('SM-07', 'Brake pads inspection', '2026-12-07', { id: 'a' });
    const b = task('SM-07', 'Chain adjust', '2026-12-21', { id: 'b' });
    const c = task('SM-07', 'Oil change', '2026-12-22', { id: 'c' });
    // 7 Dec + 14 days = 21 Dec (inside the window); 22 Dec is the 15th day (date-fns differenceInCalendarDays agrees).
    expect(groupIntoVisits([c, b, a], 14, 600).map((g) => g.taskIds)).toEqual([['a', 'b'], ['c']]);
  });

  it('uses 600 km of riding when that comes first: 50 km a day gives a 12-day window', () => {
    const usage = { usageKmPerDay: 50, remainingKm: 100 };
    const a = task('SM-03', 'Oil change', '2026-12-07', { id: 'a', ...usage });
    const b = task('SM-03', 'Chain adjust', '2026-12-19', { id: 'b', ...usage });
    const c = task('SM-03', 'Air filter', '2026-12-20', { id: 'c', ...usage });
    // 600 km ÷ 50 km/day = 12 days (arithmetic): 19 Dec is day 12, 20 Dec day 13.
    expect(groupIntoVisits([a, b, c], 14, 600).map((g) => g.taskIds)).toEqual([['a', 'b'], ['c']]);
    // At 20 km a day 600 km is 30 days, so the 14 days come first and all three go together.
    const slow = [a, b, c].map((t) => ({ ...t, usageKmPerDay: 20 }));
    expect(groupIntoVisits(slow, 14, 600).map((g) => g.taskIds)).toEqual([['a', 'b', 'c']]);
  });

  it("takes its latest day from the safety-critical items, adds the minutes and keys the visit by bike and first task", () => {
    const oil = task('SM-05', 'Oil change', '2026-12-08', { id: 'oil', minutes: 45 });
    const brakes = task('SM-05', 'Brake pads inspection', '2026-12-11', { id: 'brakes', minutes: 30, safetyCritical: true });
    const [g] = groupIntoVisits([brakes, oil], 14, 600);
    expect(g).toMatchObject({ key: 'SM-05:oil', latestDate: '2026-12-11', minutes: 75, taskIds: ['oil', 'brakes'] });
    const [plain] = groupIntoVisits([oil, { ...brakes, safetyCritical: false }], 14, 600);
    expect(plain.latestDate).toBe('2026-12-08');
  });
});

describe('planWorkshop on hand-made weeks', () => {
  it('works round a bike booked all week and all weekend: the one free weekday before its due date', () => {
    const sm07 = bike('SM-07', 'quay', 'Breeze 125', {
      bookings: [
        { bookingId: 'coast', kind: 'hire', title: 'Coast tour', start: at(WEEK[0], 9), end: at(WEEK[3], 17) },
        { bookingId: 'family', kind: 'hire', title: 'Family weekend', start: at(WEEK[5], 9), end: at(WEEK[6], 17) },
      ],
    });
    const input = scene({ bikes: [sm07], tasks: [task('SM-07', 'Brake pads inspection', '2026-12-12', { minutes: 90, safetyCritical: true })] });
    const plan = planWorkshop(input);
    expect(brokenRules(input, plan)).toEqual([]);
    expect(plan.unplaced).toEqual([]);
    const [v] = plan.visits;
    // Mon 08:00–09:00 is too short for 90 minutes; Fri 11 Dec is the only free weekday (Tomasz works Mon–Fri).
    expect([v.start, v.technicianId]).toEqual([at(WEEK[4], 8), 'tomasz']);
    expect(v.why).toContain("SM-07 is on hire 'Coast tour' Mon 7 Dec 09:00 – Thu 10 Dec 17:00.");
    expect(v.why[0]).toBe('Brake pads inspection due Sat 12 Dec.');
    expect(dayName(v.start)).toBe('Fri 11 Dec');
  });

  it('keeps 3 Breeze 125 free for a weekly lesson and plans the work after it', () => {
    // Source: rrule expands the weekly lesson (RFC 5545 FREQ=WEEKLY;BYDAY=TU) inside the week.
    const rule = new RRule({ freq: RRule.WEEKLY, byweekday: [RRule.TU], dtstart: new Date(at(WEEK[0], 9)), count: 4 });
    const lessons: ModelDemand[] = rule
      .between(new Date(at(WEEK[0], 0)), new Date(at(WEEK[6], 23)), true)
      .map((d, i) => ({ bookingId: `beginners-${i}`, siteId: 'airfield', modelId: 'Breeze 125', quantity: 3, kind: 'lesson', title: 'Beginners', start: d.getTime(), end: d.getTime() + 3 * HOUR }));
    expect(lessons.map((l) => dayName(l.start))).toEqual(['Tue 8 Dec']);
    const bikes = ['AF-01', 'AF-02', 'AF-03'].map((id) => bike(id, 'airfield', 'Breeze 125'));
    const technicians = [{ id: 'priya', name: 'Priya Vale', siteId: 'airfield', shifts: shifts(WEEK.slice(1, 6)) }];
    const input = scene({ bikes, demands: lessons, technicians, tasks: [task('AF-02', 'Valve clearance check', '2026-12-09', { minutes: 240 })] });
    const plan = planWorkshop(input);
    expect(brokenRules(input, plan)).toEqual([]);
    const [v] = plan.visits;
    expect(v.start).toBe(at(WEEK[1], 12));
    expect(plan.objective.bookedHoursLost).toBe(0);
    expect(v.why).toContain("3 Breeze 125 stay free at Airfield for lesson 'Beginners' Tue 8 Dec 09:00–12:00.");
    expect(checkPlacement(input, { id: 'new', bikeId: 'AF-02', taskIds: v.taskIds }, { start: at(WEEK[1], 8), bayId: 'air-1', technicianId: 'priya' })).toEqual([
      "Only 2 Breeze 125 would be left at Airfield for lesson 'Beginners' (needs 3).",
    ]);
  });

  it("plans nothing with a technician on their day off", () => {
    const technicians = [
      { id: 'tomasz', name: 'Tomasz Reed', siteId: 'quay', shifts: shifts(weekdays.filter((d) => d !== '2026-12-09')) },
      { id: 'priya', name: 'Priya Vale', siteId: 'airfield', shifts: shifts(WEEK.slice(0, 6)) },
    ];
    const bikes = ['SM-01', 'SM-02', 'SM-03', 'SM-04', 'SM-05', 'SM-06'].map((id) => bike(id, 'quay', 'Strider 125'));
    const tasks = bikes.map((b) => task(b.id, 'Oil change', '2026-12-10', { minutes: 180 }));
    const input = scene({ bikes, tasks, technicians });
    const plan = planWorkshop(input);
    expect(brokenRules(input, plan)).toEqual([]);
    expect(plan.visits).toHaveLength(6);
    expect(plan.visits.filter((v) => dayName(v.start) === 'Wed 9 Dec')).toEqual([]);
    expect(checkPlacement(input, { id: 'x', bikeId: 'SM-01', taskIds: [tasks[0].id] }, { start: at('2026-12-09', 10), bayId: 'quay-1', technicianId: 'tomasz' })).toContain(
      'Tomasz Reed is not working on Wed 9 Dec.',
    );
  });

  it('says why work cannot go before its due date, how much time is short, and a way out', () => {
    const technicians = [
      { id: 'tomasz', name: 'Tomasz Reed', siteId: 'quay', shifts: shifts(weekdays) },
      { id: 'priya', name: 'Priya Vale', siteId: 'airfield', shifts: shifts([WEEK[0], WEEK[1]]) },
    ];
    const bikes = [bike('AF-01', 'airfield', 'Strider 125'), bike('AF-02', 'airfield', 'Strider 125')];
    const tasks = [
      task('AF-01', 'Brake pads inspection', '2026-12-07', { id: 'af1', minutes: 360, safetyCritical: true }),
      task('AF-02', 'Tyres inspection', '2026-12-07', { id: 'af2', minutes: 360, safetyCritical: true }),
    ];
    const input = scene({ bikes, tasks, technicians });
    const plan = planWorkshop(input);
    expect(brokenRules(input, plan)).toEqual([]);
    // 12 h of work due Mon at a one-bay site where Priya works 8.5 h: one visit on Monday, the other on Tuesday, a day late.
    expect(plan.visits.map((v) => dayName(v.start))).toEqual(['Mon 7 Dec', 'Tue 8 Dec']);
    expect(plan.objective.safetyLateDays).toBe(1);
    const [late] = plan.unplaced;
    expect(late.taskId).toBe('af2');
    expect(late.reason).toBe('Placed on Tue 8 Dec, 1 day after Tyres inspection falls due (Mon 7 Dec). No bay and technician free at Airfield before Mon 7 Dec; 6 h short.');
    expect(late.remedy).toBe('Move AF-02 to Quay Street and plan it there (Mon 7 Dec 08:00 is free), or overtime for Priya Vale on Mon 7 Dec.');

    // With no shift left in the week, the second visit is left out and says so.
    const monday = scene({ bikes, tasks, technicians: [technicians[0], { ...technicians[1], shifts: shifts([WEEK[0]]) }] });
    const out = planWorkshop(monday);
    expect(out.visits).toHaveLength(1);
    expect(out.unplaced[0].reason).toBe('No bay and technician free at Airfield before Mon 7 Dec; 6 h short.');
  });
});

describe('planWorkshop: work that fits no shift, and work that can wait', () => {
  it('says a task is longer than any shift (08:00–16:30 is 8.5 h) and offers to split it', () => {
    const input = scene({ bikes: [bike('SM-02', 'quay', 'Ridgeback 400')], tasks: [task('SM-02', 'Valve clearance check', '2026-12-10', { id: 'long', minutes: 600 })] });
    const plan = planWorkshop(input);
    expect(plan.visits).toEqual([]);
    expect(plan.unplaced[0]).toMatchObject({ taskId: 'long', reason: 'It takes 10 h; the longest shift at Quay Street is 8.5 h.' });
    expect(plan.unplaced[0].remedy).toMatch(/^Split the work into shorter tasks, or plan a longer shift for one technician/);
  });

  it('leaves work due after the plan for a later plan when the week is full, and says nothing is needed yet', () => {
    const technicians = [
      { id: 'tomasz', name: 'Tomasz Reed', siteId: 'quay', shifts: shifts([WEEK[0]]) },
      { id: 'priya', name: 'Priya Vale', siteId: 'airfield', shifts: [] },
    ];
    const bikes = [bike('SM-01', 'quay', 'Strider 125'), bike('SM-02', 'quay', 'Strider 125')];
    const tasks = [task('SM-01', 'Oil change', '2026-12-07', { id: 'now', minutes: 480 }), task('SM-02', 'Oil change', '2026-12-21', { id: 'later', minutes: 120 })];
    const plan = planWorkshop(scene({ bikes, tasks, technicians }));
    expect(plan.visits.map((v) => v.taskIds)).toEqual([['now']]);
    expect(plan.unplaced).toEqual([
      {
        taskId: 'later',
        bikeId: 'SM-02',
        siteId: 'quay',
        reason: 'No bay and technician free at Quay Street up to Sun 13 Dec; it falls due Mon 21 Dec, so a later plan can take it.',
        remedy: 'Nothing is needed yet; to do it sooner: overtime for Tomasz Reed on Sun 13 Dec.',
      },
    ]);
  });
});

describe('what a plan made now takes in', () => {
  it('leaves a visit due wholly after the horizon for a later plan, and keeps later items that join a visit due inside it', () => {
    const bikes = [bike('SM-01', 'quay', 'Strider 125'), bike('SM-02', 'quay', 'Strider 125')];
    const tasks = [
      task('SM-01', 'Oil change', '2026-12-09', { id: 'oil' }),
      // 9 Dec + 14 days = 23 Dec: inside SM-01's window, so it comes in with the oil change.
      task('SM-01', 'Chain adjust', '2026-12-20', { id: 'chain' }),
      // Due 7 Jan, alone: weeks after the plan's last day (Sun 13 Dec).
      task('SM-02', 'Chain adjust', '2027-01-07', { id: 'far' }),
    ];
    const input = dueWithinHorizon(scene({ bikes, tasks }));
    expect(input.tasks.map((t) => t.id)).toEqual(['oil', 'chain']);
    const plan = planWorkshop(input);
    expect(plan.visits.map((v) => v.taskIds)).toEqual([['oil', 'chain']]);
    expect(plan.unplaced).toEqual([]);
  });

  it('says work was already overdue when the plan was made, and for safety-critical work to keep the bike in', () => {
    const technicians = [
      { id: 'tomasz', name: 'Tomasz Reed', siteId: 'quay', shifts: shifts(weekdays) },
      { id: 'priya', name: 'Priya Vale', siteId: 'airfield', shifts: [] },
    ];
    // Due Fri 4 Dec, before the plan's first day (Mon 7 Dec).
    const input = scene({ bikes: [bike('SM-01', 'quay', 'Strider 125')], tasks: [task('SM-01', 'Brake pads inspection', '2026-12-04', { id: 'late', safetyCritical: true })], technicians });
    const plan = planWorkshop(input);
    expect(plan.visits.map((v) => dayName(v.start))).toEqual(['Mon 7 Dec']);
    expect(plan.unplaced).toHaveLength(1);
    expect(plan.unplaced[0].reason).toBe('Placed on Mon 7 Dec, 3 days after Brake pads inspection falls due (Fri 4 Dec). It was already overdue when this plan was made (due Fri 4 Dec), so no time before its due date is left.');
    expect(plan.unplaced[0].remedy).toBe('Keep SM-01 off hires and lessons until the work is signed off.');
  });
});

describe('checkPlacement', () => {
  const sm07 = bike('SM-07', 'quay', 'Breeze 125', { bookings: [{ bookingId: 'family', kind: 'hire', title: 'Family weekend', start: at(WEEK[5], 9), end: at(WEEK[6], 17) }] });
  const sm04 = bike('SM-04', 'quay', 'Strider 125');
  const brakes = task('SM-07', 'Brake pads inspection', '2026-12-08', { id: 'brakes', minutes: 90, safetyCritical: true });
  const fixed: FixedVisit[] = [
    { id: 'v-sm04', bikeId: 'SM-04', siteId: 'quay', bayId: 'quay-2', technicianId: 'tomasz', start: at(WEEK[1], 9), end: at(WEEK[1], 10, 30), taskIds: ['other'] },
    { id: 'v-sm07', bikeId: 'SM-07', siteId: 'quay', bayId: 'quay-1', technicianId: 'tomasz', start: at(WEEK[0], 13), end: at(WEEK[0], 14), taskIds: ['earlier'] },
  ];
  const input = scene({ bikes: [sm07, sm04], tasks: [brakes], fixed });
  const move = (day: string, h: number, m: number, bayId: string, technicianId = 'tomasz') =>
    checkPlacement(input, { id: 'moving', bikeId: 'SM-07', taskIds: ['brakes'] }, { start: at(day, h, m), bayId, technicianId });

  it('allows a free spot', () => {
    expect(move(WEEK[0], 9, 0, 'quay-1')).toEqual([]);
  });
  it('names the bay and the technician taken by another bike', () => {
    expect(move(WEEK[1], 9, 30, 'quay-2')).toEqual(['Bay 2 at Quay Street is taken 09:00–10:30 by SM-04.', 'Tomasz Reed is busy 09:00–10:30 with SM-04.']);
  });
  it("names the technician's hours, day off and site", () => {
    expect(move(WEEK[0], 16, 0, 'quay-1')).toEqual(['Tomasz Reed works 08:00–16:30 on Mon 7 Dec; the visit would run 16:00–17:30.']);
    expect(move(WEEK[0], 9, 0, 'quay-1', 'priya')).toEqual(['Priya Vale works at Airfield, not Quay Street: pick a technician of Quay Street.']);
  });
  it("names the bike's own booking and its other visit", () => {
    expect(move(WEEK[5], 9, 0, 'quay-1')).toEqual([
      'Tomasz Reed is not working on Sat 12 Dec.',
      "SM-07 is on hire 'Family weekend' Sat 12 Dec 09:00 – Sun 13 Dec 17:00.",
      "That is after SM-07's Brake pads inspection falls due on Tue 8 Dec.",
    ]);
    expect(move(WEEK[0], 12, 30, 'quay-2')).toEqual(['Tomasz Reed is busy 13:00–14:00 with SM-07.', 'SM-07 is already in the workshop 13:00–14:00 (Bay 1).']);
  });
  it('refuses a start off the quarter hour, outside the plan, or after a safety-critical due date', () => {
    expect(move(WEEK[0], 9, 10, 'quay-1')).toEqual(['Visits start on the quarter hour: pick a start at :00, :15, :30 or :45.']);
    expect(move('2026-12-06', 9, 0, 'quay-1')[0]).toMatch(/^That is outside the plan's days: pick a start between Mon 7 Dec 00:00 and Sun 13 Dec 22:30\.$/);
    expect(move(WEEK[2], 9, 0, 'quay-1')).toEqual(["That is after SM-07's Brake pads inspection falls due on Tue 8 Dec."]);
  });
});
