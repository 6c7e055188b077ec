import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import ICAL from 'ical.js';
import { eq, sql } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, world } from '../support/factories';
import { bays, bookings, serviceTasks, siteHours, visits, workPatterns } from '../../server/db/schema';
import type { Db } from '../../server/db/client';
import type { PlanAnswer } from '../../shared/schemas/plan';

// Monday 7 December 2026, 07:00 in London (UTC in winter).
const clock = manualClock('2026-12-07T07:00:00Z');

async function workshop(db: Db, siteId: string, technicianId: string) {
  await db.delete(bays).where(eq(bays.siteId, siteId));
  const [bay] = await db.insert(bays).values({ siteId, name: 'Bay 1', position: 1 }).returning();
  for (let weekday = 1; weekday <= 6; weekday++) await db.insert(siteHours).values({ siteId, weekday, opensAt: '08:00', closesAt: '17:00' });
  await db.insert(workPatterns).values({ userId: technicianId, siteId, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', startsOn: '2026-11-30', startTime: '08:00', endTime: '16:30' });
  return bay;
}

let ctx: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let manager: Agent;
let tech: Agent;
let bayId: string;
let oilTask: string;
let brakeTask: string;
let blockedTask: string;

beforeAll(async () => {
  ctx = await testApp({ now: clock.now });
  const db = ctx.database.db;
  w = await world(db);
  bayId = (await workshop(db, w.siteA.id, w.people.technician.id)).id;
  const oil = await makeServiceItem(db, w.model.id, { name: 'Engine oil and filter', category: 'oil', estimatedMinutes: 60 });
  const brakes = await makeServiceItem(db, w.model.id, { name: 'Brake pads and tyres', category: 'brakes', safetyCritical: true, estimatedMinutes: 45 });
  const task = async (bikeId: string, itemId: string, dueDate: string, minutes: number) =>
    (await db.insert(serviceTasks).values({ bikeId, serviceItemId: itemId, cycleKey: `c-${dueDate}`, dueDate, estimatedMinutes: minutes }).returning())[0].id;
  oilTask = await task(w.bikeA.id, oil.id, '2026-12-10', 60);
  brakeTask = await task(w.bikeA.id, brakes.id, '2026-12-09', 45);
  // Bike A is hired out all of today.
  await db.insert(bookings).values({ siteId: w.siteA.id, kind: 'hire', bikeId: w.bikeA.id, startAt: new Date('2026-12-07T08:00:00Z'), endAt: new Date('2026-12-07T18:00:00Z'), title: 'Coast road day hire' });
  // A second bike is booked for three weeks: its work cannot be placed.
  const busy = await makeBike(db, w.model.id, w.siteA.id, { fleetNumber: 'SM-90' });
  blockedTask = await task(busy.id, oil.id, '2026-12-12', 60);
  await db.insert(bookings).values({ siteId: w.siteA.id, kind: 'hire', bikeId: busy.id, startAt: new Date('2026-12-06T08:00:00Z'), endAt: new Date('2026-12-28T18:00:00Z'), title: 'Winter tour' });

  manager = await agent(ctx.app);
  await manager.login(w.people.manager.email, PASSWORD);
  tech = await agent(ctx.app);
  await tech.login(w.people.technician.email, PASSWORD);
});
afterAll(() => ctx?.close());

const planOf = async (a: Agent, q = '') => {
  const res = await a.get(`/api/plan?site=${w.siteA.id}${q}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as PlanAnswer;
};

describe('the workshop plan', () => {
  it('places a bike’s due work in one visit, on a free bay, with a working technician, around its hire, before its latest day', async () => {
    const run = await manager.post('/api/plan/run').send({ site: w.siteA.id });
    expect(run.status, JSON.stringify(run.body)).toBe(200);
    const plan = await planOf(manager);
    const visit = plan.visits.find((v) => v.bikeId === w.bikeA.id)!;
    expect(visit).toBeDefined();
    // Items due 9 and 10 Dec fall within 14 days of each other: one visit.
    expect(new Set(visit.taskIds)).toEqual(new Set([oilTask, brakeTask]));
    // The earliest safety-critical due date is the visit's latest day.
    expect(visit.latestDate).toBe('2026-12-09');
    expect(visit.bayId).toBe(bayId);
    expect(visit.technicianId).toBe(w.people.technician.id);
    const start = Date.parse(visit.start);
    const end = Date.parse(visit.end);
    expect(end - start).toBe(105 * 60_000);
    // Not during today's hire (until 18:00), inside 08:00–16:30 of a weekday, and done by the end of 9 Dec.
    expect(start).toBeGreaterThanOrEqual(Date.parse('2026-12-07T18:00:00Z'));
    expect(end).toBeLessThanOrEqual(Date.parse('2026-12-10T00:00:00Z'));
    const d = new Date(start);
    expect(d.getUTCHours() * 60 + d.getUTCMinutes()).toBeGreaterThanOrEqual(8 * 60);
    expect(d.getUTCHours() * 60 + d.getUTCMinutes() + 105).toBeLessThanOrEqual(16 * 60 + 30);
    expect(visit.why.length).toBeGreaterThan(0);
    // The planned technician now has the tasks.
    const [t] = await ctx.database.db.select().from(serviceTasks).where(eq(serviceTasks.id, oilTask));
    expect(t.assigneeId).toBe(w.people.technician.id);
  });

  it('lists work it cannot place before its due date, with a reason and a way out in words', async () => {
    const plan = await planOf(manager);
    const u = plan.unplaced.find((x) => x.taskId === blockedTask)!;
    expect(u).toBeDefined();
    expect(u.fleetNumber).toBe('SM-90');
    expect(u.reason.length).toBeGreaterThan(10);
    expect(u.remedy.length).toBeGreaterThan(10);
  });

  it('gives capacity per day: planned against available minutes', async () => {
    const plan = await planOf(manager, '&from=2026-12-07&to=2026-12-13');
    const days = plan.capacity.filter((c) => c.siteId === w.siteA.id);
    expect(days.map((c) => c.date)).toEqual(['2026-12-07', '2026-12-08', '2026-12-09', '2026-12-10', '2026-12-11', '2026-12-12', '2026-12-13']);
    // One technician 08:00–16:30 on weekdays (from 07:00 today), none at the weekend.
    expect(days.find((c) => c.date === '2026-12-08')!.availableMinutes).toBe(510);
    expect(days.find((c) => c.date === '2026-12-12')!.availableMinutes).toBe(0);
    expect(days.reduce((n, c) => n + c.plannedMinutes, 0)).toBe(105);
    expect(plan.bays.map((b) => b.id)).toContain(bayId);
    expect(plan.technicians.map((t) => t.id)).toContain(w.people.technician.id);
    expect(plan.bookings.some((b) => b.title === 'Coast road day hire')).toBe(true);
  });

  it('keeps a visit’s id and sequence when a re-plan leaves it where it was', async () => {
    const before = (await planOf(manager)).visits.find((v) => v.bikeId === w.bikeA.id)!;
    await manager.post('/api/plan/run').send({ site: w.siteA.id });
    const after = (await planOf(manager)).visits.find((v) => v.bikeId === w.bikeA.id)!;
    expect(after.id).toBe(before.id);
    expect(after.sequence).toBe(before.sequence);
    expect(after.start).toBe(before.start);
  });

  it('refuses a move onto the bike’s hire, in words, and changes nothing', async () => {
    const before = (await planOf(manager)).visits.find((v) => v.bikeId === w.bikeA.id)!;
    const res = await manager.patch(`/api/plan/visits/${before.id}`).send({ start: '2026-12-07T10:00:00Z', bayId, technicianId: w.people.technician.id });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/hire/i);
    const after = (await planOf(manager)).visits.find((v) => v.id === before.id)!;
    expect(after).toEqual(before);
  });

  it('refuses a move after the visit’s latest day', async () => {
    const v = (await planOf(manager)).visits.find((x) => x.bikeId === w.bikeA.id)!;
    const res = await manager.patch(`/api/plan/visits/${v.id}`).send({ start: '2026-12-10T09:00:00Z', bayId, technicianId: w.people.technician.id });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/after/i);
  });

  it('moves a visit to a free time, pins it, raises its sequence, and the calendar feed follows with the same UID', async () => {
    const feedUrl = (await tech.get('/api/calendar/feed')).body.url as string;
    const path = new URL(feedUrl).pathname;
    const eventOf = async (visitId: string) => {
      const ics = (await tech.get(path)).text;
      // Read back with ical.js, a general iCalendar (RFC 5545) parser.
      const cal = new ICAL.Component(ICAL.parse(ics));
      const ev = cal.getAllSubcomponents('vevent').find((e) => e.getFirstPropertyValue('uid') === `visit-${visitId}@lashline`);
      return ev && { sequence: Number(ev.getFirstPropertyValue('sequence') ?? 0), start: (ev.getFirstPropertyValue('dtstart') as ICAL.Time).toJSDate().toISOString() };
    };
    const v = (await planOf(manager)).visits.find((x) => x.bikeId === w.bikeA.id)!;
    const before = await eventOf(v.id);
    expect(before).toBeDefined();
    const res = await manager.patch(`/api/plan/visits/${v.id}`).send({ start: '2026-12-09T13:00:00Z', bayId, technicianId: w.people.technician.id });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.visit.start).toBe('2026-12-09T13:00:00.000Z');
    expect(res.body.visit.pinned).toBe(true);
    expect(res.body.visit.sequence).toBe(v.sequence + 1);
    const after = await eventOf(v.id);
    expect(after!.sequence).toBe(before!.sequence + 1);
    expect(after!.start).toBe('2026-12-09T13:00:00.000Z');
    // A re-plan leaves a pinned visit where the manager put it.
    await manager.post('/api/plan/run').send({ site: w.siteA.id });
    const again = (await planOf(manager)).visits.find((x) => x.id === v.id)!;
    expect(again.start).toBe('2026-12-09T13:00:00.000Z');
  });

  it('gives the technician their day in visit order, and the desk the visits of the next two days', async () => {
    const day = await tech.get('/api/plan/my-day?date=2026-12-09');
    expect(day.status).toBe(200);
    expect(day.body.visits.map((v: { bikeId: string }) => v.bikeId)).toEqual([w.bikeA.id]);
    expect(day.body.visits[0].tasks.map((t: { itemName: string }) => t.itemName)).toEqual(['Brake pads and tyres', 'Engine oil and filter']);
    const desk = await agent(ctx.app);
    await desk.login(w.people.desk.email, PASSWORD);
    const next = await desk.get(`/api/plan/next-visits?site=${w.siteA.id}`);
    expect(next.status).toBe(200);
    const item = next.body.items.find((x: { bikeId: string }) => x.bikeId === w.bikeA.id);
    expect(item).toMatchObject({ bayName: 'Bay 1', today: false });
  });

  it('keeps other sites’ plans to their own people', async () => {
    const other = await agent(ctx.app);
    await other.login(w.people.technicianB.email, PASSWORD);
    expect((await other.get(`/api/plan?site=${w.siteA.id}`)).status).toBe(404);
    const v = (await planOf(manager)).visits[0];
    expect((await tech.patch(`/api/plan/visits/${v.id}`).send({ start: v.start, bayId, technicianId: v.technicianId })).status).toBe(403);
  });

  it('ends the visit when its work is signed off, and cancels it in the calendar when no longer needed', async () => {
    const v = (await planOf(manager)).visits.find((x) => x.bikeId === w.bikeA.id)!;
    for (const id of [brakeTask, oilTask]) {
      const t = (await tech.get(`/api/tasks/${id}`)).body.task;
      const res = await tech.post(`/api/tasks/${id}/close`).send({ version: t.version, readings: [] });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
    }
    const [row] = await ctx.database.db.select().from(visits).where(eq(visits.id, v.id));
    expect(row.status).toBe('done');
    expect((await planOf(manager)).visits.find((x) => x.id === v.id)).toBeUndefined();
    const left = await ctx.database.db.execute(sql`select count(*)::int as n from visit_tasks where visit_id = ${v.id}`);
    expect((left as unknown as { rows: { n: number }[] }).rows[0].n).toBe(2);
  });

  it('refuses bad plan queries in words', async () => {
    const res = await manager.get(`/api/plan?site=${w.siteA.id}&from=2026-12-20&to=2026-12-01`);
    expect(res.status).toBe(400);
    expect(JSON.stringify(res.body)).toMatch(/Swap/);
    const bad = await manager.patch(`/api/plan/visits/${w.bikeA.id}`).send({ start: 'tomorrow', bayId, technicianId: w.people.technician.id });
    expect(bad.status).toBe(400);
  });
});
