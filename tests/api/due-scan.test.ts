import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import Papa from 'papaparse';
import ICAL from 'ical.js';
import { and, eq } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, makeUser, world } from '../support/factories';
import { auditLog, bikes, odometerReadings, serviceTasks, unplacedTasks, visitTasks, visits } from '../../server/db/schema';
import { run as dueScan } from '../../jobs/due-scan';

const clock = manualClock('2026-06-15T09:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let manager: Agent;
const ids: Record<string, string> = {};

beforeAll(async () => {
  t = await testApp({ now: clock.now });
  const db = t.database.db;
  w = await world(db);
  await makeServiceItem(db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6, estimatedMinutes: 30 });
  await makeServiceItem(db, w.model.id, { name: 'Brake check', category: 'brakes', everyKm: 3000, everyMonths: 3, safetyCritical: true, estimatedMinutes: 20 });
  // A second technician at site A with nothing to do yet: new work should go to the less loaded one.
  ids.tech2 = (await makeUser(db, 'technician', [w.siteA.id])).id;
  // Overdue by km: 5,600 km since entering service on 1 May.
  const far = await makeBike(db, w.model.id, w.siteA.id, { fleetNumber: 'FAR', inServiceDate: '2026-05-01' });
  // Barely ridden, in service 6 months and 1 day ago: oil due by calendar, brakes long overdue.
  const idle = await makeBike(db, w.model.id, w.siteA.id, { fleetNumber: 'IDLE', inServiceDate: '2025-12-14' });
  // Fine: new this month, little distance.
  const fine = await makeBike(db, w.model.id, w.siteA.id, { fleetNumber: 'FINE', inServiceDate: '2026-06-10' });
  Object.assign(ids, { far: far.id, idle: idle.id, fine: fine.id });
  await db.insert(odometerReadings).values([
    { bikeId: far.id, date: '2026-05-01', value: 0, unit: 'km', odometerKm: 0 },
    { bikeId: far.id, date: '2026-06-14', value: 5600, unit: 'km', odometerKm: 5600 },
    { bikeId: idle.id, date: '2026-06-01', value: 40, unit: 'km', odometerKm: 40 },
    { bikeId: fine.id, date: '2026-06-14', value: 80, unit: 'km', odometerKm: 80 },
  ]);
  // Only these three bikes take part: the world's own bikes are retired.
  await db.update(bikes).set({ status: 'retired' }).where(eq(bikes.id, w.bikeA.id));
  await db.update(bikes).set({ status: 'retired' }).where(eq(bikes.id, w.bikeB.id));
  manager = await agent(t.app);
  await manager.login(w.people.manager.email, PASSWORD);
});
afterAll(() => t.close());

const deps = () => ({ ...{ db: t.database.db, now: clock.now, publicUrl: 'http://lashline.test', log: () => {} }, mail: { transport: () => { throw new Error('no mail'); }, from: 'x' } });

describe('the due scan', () => {
  it('raises one task per due item, and nothing on a second run (common practice: one work order per due cycle)', async () => {
    const first = await dueScan(deps());
    expect(first.tasksRaised).toBeGreaterThanOrEqual(3);
    const second = await dueScan(deps());
    expect(second.tasksRaised).toBe(0);
    const tasks = await t.database.db.select().from(serviceTasks);
    const keys = tasks.map((x) => `${x.bikeId}:${x.serviceItemId}`);
    expect(new Set(keys).size).toBe(keys.length);
    expect(tasks.some((x) => x.bikeId === ids.fine)).toBe(false);
    // The nightly run re-plans after it raises: every open task has a visit or a reason why not.
    expect(Number(first.planVisits) + Number(first.planUnplaced)).toBeGreaterThan(0);
    const placed = await t.database.db.select({ taskId: visitTasks.taskId }).from(visitTasks).innerJoin(visits, eq(visits.id, visitTasks.visitId)).where(eq(visits.status, 'planned'));
    const listed = await t.database.db.select({ taskId: unplacedTasks.taskId }).from(unplacedTasks);
    const accounted = new Set([...placed, ...listed].map((r) => r.taskId));
    for (const task of tasks.filter((x) => x.status === 'open')) expect(accounted.has(task.id), `task ${task.id} neither planned nor listed`).toBe(true);
  });

  it('raises nothing twice when two scans run at once', async () => {
    const a = await makeBike(t.database.db, w.model.id, w.siteA.id, { fleetNumber: 'TWIN', inServiceDate: '2025-01-01' });
    const [r1, r2] = await Promise.all([dueScan(deps()), dueScan(deps())]);
    expect(Number(r1.tasksRaised) + Number(r2.tasksRaised)).toBe(2);
    expect((await t.database.db.select().from(serviceTasks).where(eq(serviceTasks.bikeId, a.id))).length).toBe(2);
    await t.database.db.update(bikes).set({ status: 'retired' }).where(eq(bikes.id, a.id));
  });

  it('grounds a bike whose safety-critical item is overdue, and says why', async () => {
    const [idle] = await t.database.db.select().from(bikes).where(eq(bikes.id, ids.idle));
    expect(idle.status).toBe('out_of_service');
    expect(idle.statusReason).toContain('Brake check');
    // Recorded once, by the scan (no person), with the reason.
    const trail = await t.database.db.select().from(auditLog).where(and(eq(auditLog.entityId, ids.idle), eq(auditLog.action, 'grounded')));
    expect(trail).toHaveLength(1);
    expect(trail[0]).toMatchObject({ userId: null, entity: 'bike', changes: { status: ['in_service', 'out_of_service'], reason: idle.statusReason } });
  });

  it('spreads new work over the site’s technicians by open minutes', async () => {
    const tasks = await t.database.db.select().from(serviceTasks);
    const assignees = new Set(tasks.map((x) => x.assigneeId));
    expect(assignees.has(w.people.technician.id)).toBe(true);
    expect(assignees.has(ids.tech2)).toBe(true);
  });
});

describe('GET /api/due', () => {
  it('lists overdue items first, then by due date, for the user’s sites', async () => {
    const res = await manager.get('/api/due?within=7');
    expect(res.status).toBe(200);
    const items = res.body.items as { fleetNumber: string; item: string; status: string; trigger: string; assignee: unknown }[];
    const statuses = items.map((i) => i.status);
    expect(statuses.indexOf('overdue')).toBe(0);
    expect(statuses.lastIndexOf('overdue')).toBeLessThan(statuses.indexOf('soon') === -1 ? Infinity : statuses.indexOf('soon'));
    const farOil = items.find((i) => i.fleetNumber === 'FAR' && i.item === 'Engine oil')!;
    expect(farOil).toMatchObject({ status: 'overdue', trigger: 'km' });
    const idleOil = items.find((i) => i.fleetNumber === 'IDLE' && i.item === 'Engine oil')!;
    expect(idleOil).toMatchObject({ status: 'overdue', trigger: 'calendar' });
    expect(items.some((i) => i.fleetNumber === 'FINE')).toBe(false);
    expect(items.every((i) => i.assignee)).toBe(true);
  });

  it('refuses a window out of range and a signed-out caller', async () => {
    expect((await manager.get('/api/due?within=999')).status).toBe(400);
    expect((await request(t.app).get('/api/due')).status).toBe(401);
  });

  it('exports the same rows as CSV (RFC 4180, parsed back with papaparse)', async () => {
    const json = await manager.get('/api/due?within=14');
    const res = await manager.get('/api/due.csv?within=14');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.text).toContain('\r\n');
    const parsed = Papa.parse<string[]>(res.text.trim(), { skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data[0][0]).toBe('fleet_number');
    expect(parsed.data.length - 1).toBe(json.body.items.length);
  });
});

describe('the calendar feed (RFC 5545, read back with ical.js)', () => {
  it('serves one all-day event per due item at a secret address, and a reset kills the old one', async () => {
    const { url } = (await manager.get('/api/calendar/feed')).body;
    const path = new URL(url).pathname;
    const feed = await request(t.app).get(path);
    expect(feed.status).toBe(200);
    expect(feed.headers['content-type']).toMatch(/text\/calendar/);
    const comp = new ICAL.Component(ICAL.parse(feed.text));
    const events = comp.getAllSubcomponents('vevent').map((e) => new ICAL.Event(e));
    const due = (await manager.get('/api/due?within=90')).body.items;
    expect(events.length).toBe(due.length);
    expect(events.every((e) => e.startDate.isDate)).toBe(true);
    const far = events.find((e) => e.summary.includes('FAR'))!;
    expect(far.startDate.toString()).toBe(due.find((d: { fleetNumber: string }) => d.fleetNumber === 'FAR').dueDate);
    const reset = await manager.post('/api/calendar/feed/reset');
    expect(reset.body.url).not.toBe(url);
    expect((await request(t.app).get(path)).status).toBe(404);
    expect((await request(t.app).get(new URL(reset.body.url).pathname)).status).toBe(200);
  });
});
