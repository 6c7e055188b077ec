import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeUser, world } from '../support/factories';
import { bays, siteHours, sites, timeOff, visits, workPatterns } from '../../server/db/schema';
import type { Capacity } from '../../shared/schemas/capacity';

// Monday 7 December 2026, 07:00 in London (UTC in winter).
const clock = manualClock('2026-12-07T07:00:00Z');

let ctx: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let manager: Agent;
let managerA: Agent;
let admin: Agent;
let tech: Agent;
let techB: Agent;

beforeAll(async () => {
  ctx = await testApp({ now: clock.now });
  w = await world(ctx.database.db);
  const onlyA = await makeUser(ctx.database.db, 'manager', [w.siteA.id]);
  const login = async (email: string) => {
    const a = await agent(ctx.app);
    await a.login(email, PASSWORD);
    return a;
  };
  manager = await login(w.people.manager.email);
  managerA = await login(onlyA.email);
  admin = await login(w.people.admin.email);
  tech = await login(w.people.technician.email);
  techB = await login(w.people.technicianB.email);
});
afterAll(() => ctx?.close());

const db = () => ctx.database.db;
const siteRow = async (id: string) => (await db().select().from(sites).where(eq(sites.id, id)))[0];
const bayRows = async (siteId: string) => (await db().select().from(bays).where(eq(bays.siteId, siteId))).sort((a, b) => a.position - b.position);
const capacity = async (a: Agent, q = '') => {
  const res = await a.get(`/api/capacity${q}`);
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as Capacity;
};
const planVisit = (bayId: string, start: string) =>
  db().insert(visits).values({ siteId: w.siteA.id, bikeId: w.bikeA.id, bayId, technicianId: w.people.technician.id, startAt: new Date(start), endAt: new Date(Date.parse(start) + 3_600_000), latestDate: '2026-12-20' }).returning();

describe('capacity overview', () => {
  it('lists a site\'s bays, hours and technicians, only at the person\'s own sites', async () => {
    const all = await capacity(manager);
    expect(all.sites.map((s) => s.id).sort()).toEqual([w.siteA.id, w.siteB.id].sort());
    const a = all.sites.find((s) => s.id === w.siteA.id)!;
    expect(a.bays.map((b) => b.name)).toEqual(['Bay 1']);
    expect(a.technicians.map((t) => t.id)).toEqual([w.people.technician.id]);
    expect((await capacity(tech)).sites.map((s) => s.id)).toEqual([w.siteA.id]);
    const other = await tech.get(`/api/capacity?site=${w.siteB.id}`);
    expect(other.status).toBe(404);
    expect(other.body.error.code).toBe('not_found');
  });
});

describe('opening hours', () => {
  it('replaces the whole week in one go', async () => {
    const week = [1, 2, 3, 4, 5, 6].map((weekday) => ({ weekday, opensAt: '08:00', closesAt: '17:30' }));
    const res = await manager.put(`/api/sites/${w.siteA.id}/hours`).send({ hours: week });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const two = await manager.put(`/api/sites/${w.siteA.id}/hours`).send({ hours: [{ weekday: 6, opensAt: '09:00', closesAt: '12:00' }, { weekday: 1, opensAt: '08:00', closesAt: '16:00' }] });
    expect(two.body.hours.map((h: { weekday: number }) => h.weekday)).toEqual([1, 6]);
    expect((await db().select().from(siteHours).where(eq(siteHours.siteId, w.siteA.id))).length).toBe(2);
  });

  it('refuses bad hours in words and keeps the old week', async () => {
    const backwards = await manager.put(`/api/sites/${w.siteA.id}/hours`).send({ hours: [{ weekday: 1, opensAt: '17:00', closesAt: '08:00' }] });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.message).toMatch(/Closing time must be after opening time/);
    const twice = await manager.put(`/api/sites/${w.siteA.id}/hours`).send({ hours: [{ weekday: 2, opensAt: '08:00', closesAt: '12:00' }, { weekday: 2, opensAt: '13:00', closesAt: '17:00' }] });
    expect(twice.status).toBe(400);
    expect(twice.body.error.message).toMatch(/each weekday once/);
    const badTime = await manager.put(`/api/sites/${w.siteA.id}/hours`).send({ hours: [{ weekday: 8, opensAt: '8am', closesAt: '17:00' }] });
    expect(badTime.status).toBe(400);
    expect(badTime.body.error.message).toMatch(/HH:MM/);
    expect((await db().select().from(siteHours).where(eq(siteHours.siteId, w.siteA.id))).length).toBe(2);
  });

  it('another site\'s hours are not found for a manager of one site', async () => {
    expect((await managerA.put(`/api/sites/${w.siteB.id}/hours`).send({ hours: [] })).status).toBe(404);
  });
});

describe('bays', () => {
  it('adds, renames and reorders bays, keeping the site\'s bay count in step', async () => {
    const added = await manager.post(`/api/sites/${w.siteA.id}/bays`).send({});
    expect(added.status, JSON.stringify(added.body)).toBe(201);
    expect(added.body.bay).toMatchObject({ name: 'Bay 2', position: 2 });
    const tyre = await manager.post(`/api/sites/${w.siteA.id}/bays`).send({ name: 'Tyre bay' });
    expect(tyre.body.bay.position).toBe(3);
    expect((await siteRow(w.siteA.id)).bays).toBe(3);

    const dupe = await manager.patch(`/api/bays/${tyre.body.bay.id}`).send({ name: 'bay 2' });
    expect(dupe.status).toBe(409);
    expect(dupe.body.error.message).toBe('This site already has a bay named “bay 2”. Choose another name.');

    const moved = await manager.patch(`/api/bays/${tyre.body.bay.id}`).send({ position: 1, name: 'Tyres' });
    expect(moved.status, JSON.stringify(moved.body)).toBe(200);
    expect((await bayRows(w.siteA.id)).map((b) => [b.name, b.position])).toEqual([['Tyres', 1], ['Bay 1', 2], ['Bay 2', 3]]);
    expect((await manager.patch(`/api/bays/${tyre.body.bay.id}`).send({})).status).toBe(400);
  });

  it('refuses to remove a bay with visits planned from today on, in words', async () => {
    const bay2 = (await bayRows(w.siteA.id)).find((b) => b.name === 'Bay 2')!;
    await planVisit(bay2.id, '2026-12-08T09:00:00Z');
    await planVisit(bay2.id, '2026-12-09T09:00:00Z');
    await planVisit(bay2.id, '2026-12-10T09:00:00Z');
    const [past] = await planVisit(bay2.id, '2026-12-01T09:00:00Z');
    await db().update(visits).set({ status: 'done' }).where(eq(visits.id, past.id));
    const res = await manager.delete(`/api/bays/${bay2.id}`);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe('Bay 2 has 3 visits planned from Tue 8 Dec. Move them first.');
    expect((await siteRow(w.siteA.id)).bays).toBe(3);

    await db().update(visits).set({ status: 'cancelled' }).where(eq(visits.bayId, bay2.id));
    const ok = await manager.delete(`/api/bays/${bay2.id}`);
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect((await bayRows(w.siteA.id)).map((b) => [b.name, b.position])).toEqual([['Tyres', 1], ['Bay 1', 2]]);
    expect((await siteRow(w.siteA.id)).bays).toBe(2);
  });

  it('another site\'s bay is not found', async () => {
    const [bayB] = await bayRows(w.siteB.id);
    expect((await managerA.patch(`/api/bays/${bayB.id}`).send({ name: 'Mine now' })).status).toBe(404);
    expect((await managerA.delete(`/api/bays/${bayB.id}`)).status).toBe(404);
    expect((await managerA.post(`/api/sites/${w.siteB.id}/bays`).send({})).status).toBe(404);
    expect((await bayRows(w.siteB.id)).map((b) => b.name)).toEqual(['Bay 1']);
  });

  it('a new site gets its bay rows, and a changed count adds or removes bays at the end', async () => {
    const created = await admin.post('/api/sites').send({ name: 'Harbour Yard', timeZone: 'Europe/London', bays: 3 });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    const id = created.body.site.id as string;
    expect(created.body.site.bays).toBe(3);
    expect((await bayRows(id)).map((b) => [b.name, b.position])).toEqual([['Bay 1', 1], ['Bay 2', 2], ['Bay 3', 3]]);

    const more = await admin.patch(`/api/sites/${id}`).send({ bays: 4 });
    expect(more.body.site.bays).toBe(4);
    expect((await bayRows(id)).map((b) => b.name)).toEqual(['Bay 1', 'Bay 2', 'Bay 3', 'Bay 4']);

    const bay3 = (await bayRows(id))[2];
    await db().insert(visits).values({ siteId: id, bikeId: w.bikeA.id, bayId: bay3.id, technicianId: w.people.technician.id, startAt: new Date('2026-12-14T09:00:00Z'), endAt: new Date('2026-12-14T10:00:00Z'), latestDate: '2026-12-20' });
    const refused = await admin.patch(`/api/sites/${id}`).send({ bays: 2, name: 'Harbour Yard 2' });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toBe('Bay 3 has 1 visit planned from Mon 14 Dec. Move them first.');
    expect(await siteRow(id)).toMatchObject({ bays: 4, name: 'Harbour Yard' });

    const fewer = await admin.patch(`/api/sites/${id}`).send({ bays: 3 });
    expect(fewer.status, JSON.stringify(fewer.body)).toBe(200);
    expect((await bayRows(id)).map((b) => b.name)).toEqual(['Bay 1', 'Bay 2', 'Bay 3']);
    expect((await siteRow(id)).bays).toBe(3);
  });
});

describe('working patterns', () => {
  const weekdays = () => ({ userId: w.people.technician.id, siteId: w.siteA.id, rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', startsOn: '2026-11-30', startTime: '08:00', endTime: '16:30' });
  let patternId: string;

  it('adds a pattern and says it in words', async () => {
    const res = await manager.post('/api/work-patterns').send(weekdays());
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.pattern).toMatchObject({ rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR', words: 'every weekday, 08:00–16:30', endsOn: null });
    patternId = res.body.pattern.id;
    const sat = await manager.post('/api/work-patterns').send({ ...weekdays(), rrule: 'rrule:freq=weekly;interval=2;byday=sa', startsOn: '2026-12-05', endTime: '12:30', label: 'Alternate Saturdays' });
    expect(sat.status, JSON.stringify(sat.body)).toBe(201);
    expect(sat.body.pattern.words).toBe('every 2 weeks on Saturday, 08:00–12:30');
    const tech = (await capacity(manager, `?site=${w.siteA.id}`)).sites[0].technicians[0];
    expect(tech.patterns.map((p) => p.label)).toEqual([null, 'Alternate Saturdays']);
  });

  it('refuses a rule that is not valid, times the wrong way round, and overlaps, in words', async () => {
    const bad = await manager.post('/api/work-patterns').send({ ...weekdays(), rrule: 'FREQ=WEEKLY;BYDAY=MO,XX' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/^That repeat rule is not valid: .+; e\.g\. FREQ=WEEKLY;BYDAY=MO,TU,WE,TH,FR$/);
    const backwards = await manager.post('/api/work-patterns').send({ ...weekdays(), rrule: 'FREQ=WEEKLY;BYDAY=SU', startTime: '16:30', endTime: '08:00' });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.message).toMatch(/end time must be after the start time/);
    const ends = await manager.post('/api/work-patterns').send({ ...weekdays(), rrule: 'FREQ=WEEKLY;BYDAY=SU', endsOn: '2026-11-01' });
    expect(ends.body.error.message).toMatch(/last day is before the first day/);
    const overlap = await manager.post('/api/work-patterns').send({ ...weekdays(), rrule: 'FREQ=WEEKLY;BYDAY=FR', startsOn: '2026-12-07', startTime: '16:00', endTime: '18:00' });
    expect(overlap.status).toBe(409);
    expect(overlap.body.error.message).toMatch(/^This overlaps technician \d+’s pattern “every weekday, 08:00–16:30” on Fri 11 Dec 2026\./);
    const notHere = await manager.post('/api/work-patterns').send({ ...weekdays(), userId: w.people.technicianB.id });
    expect(notHere.status).toBe(400);
    expect(notHere.body.error.message).toMatch(/does not work at this site/);
    const desk = await manager.post('/api/work-patterns').send({ ...weekdays(), userId: w.people.desk.id });
    expect(desk.body.error.message).toMatch(/is not a technician/);
    expect((await db().select().from(workPatterns)).length).toBe(2);
  });

  it('changes and removes a pattern; another site\'s pattern is not found', async () => {
    const changed = await manager.patch(`/api/work-patterns/${patternId}`).send({ rrule: 'FREQ=WEEKLY;BYDAY=MO,TU,WE,TH', endTime: '17:00' });
    expect(changed.status, JSON.stringify(changed.body)).toBe(200);
    expect(changed.body.pattern.words).toBe('every week on Monday, Tuesday, Wednesday, Thursday, 08:00–17:00');
    const badPatch = await manager.patch(`/api/work-patterns/${patternId}`).send({ startTime: '18:00' });
    expect(badPatch.status).toBe(400);
    const [b] = await db().insert(workPatterns).values({ userId: w.people.technicianB.id, siteId: w.siteB.id, rrule: 'FREQ=DAILY', startsOn: '2026-12-01', startTime: '08:00', endTime: '12:00' }).returning();
    expect((await managerA.patch(`/api/work-patterns/${b.id}`).send({ endTime: '13:00' })).status).toBe(404);
    expect((await managerA.delete(`/api/work-patterns/${b.id}`)).status).toBe(404);
    const gone = await manager.delete(`/api/work-patterns/${patternId}`);
    expect(gone.body).toEqual({ deleted: patternId });
    expect((await db().select().from(workPatterns).where(eq(workPatterns.id, patternId))).length).toBe(0);
  });
});

describe('time off', () => {
  it('a manager adds it for a technician of their site; a technician for themself only', async () => {
    const byManager = await manager.post('/api/time-off').send({ userId: w.people.technician.id, firstDay: '2026-12-10', lastDay: '2026-12-11', reason: 'Training course' });
    expect(byManager.status, JSON.stringify(byManager.body)).toBe(201);
    const own = await tech.post('/api/time-off').send({ userId: w.people.technician.id, firstDay: '2026-12-24', lastDay: '2026-12-24' });
    expect(own.status).toBe(201);
    const forOther = await techB.post('/api/time-off').send({ userId: w.people.technician.id, firstDay: '2026-12-24', lastDay: '2026-12-24' });
    expect(forOther.status).toBe(404);
    const colleague = await makeUser(db(), 'technician', [w.siteA.id]);
    const sameSite = await tech.post('/api/time-off').send({ userId: colleague.id, firstDay: '2026-12-24', lastDay: '2026-12-24' });
    expect(sameSite.status).toBe(403);
    expect(sameSite.body.error.message).toMatch(/only their own time off/);
    const list = (await capacity(tech)).sites[0].technicians.find((t) => t.id === w.people.technician.id)!;
    expect(list.timeOff.map((o) => [o.firstDay, o.lastDay, o.reason])).toEqual([['2026-12-10', '2026-12-11', 'Training course'], ['2026-12-24', '2026-12-24', null]]);
  });

  it('refuses days the wrong way round and more than 366 days, in words', async () => {
    const backwards = await manager.post('/api/time-off').send({ userId: w.people.technician.id, firstDay: '2026-12-11', lastDay: '2026-12-10' });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.message).toMatch(/last day is before the first day/);
    // 2027-01-01 to 2028-01-02 is 367 days (2027 has 365 days; common practice: the Gregorian calendar).
    const long = await manager.post('/api/time-off').send({ userId: w.people.technician.id, firstDay: '2027-01-01', lastDay: '2028-01-02' });
    expect(long.status).toBe(400);
    expect(long.body.error.message).toMatch(/at most 366 days/);
    const longest = await manager.post('/api/time-off').send({ userId: w.people.technician.id, firstDay: '2027-01-01', lastDay: '2028-01-01' });
    expect(longest.status).toBe(201);
    await manager.delete(`/api/time-off/${longest.body.timeOff.id}`);
  });

  it('a technician removes their own; nobody else\'s', async () => {
    const rows = await db().select().from(timeOff).where(eq(timeOff.userId, w.people.technician.id));
    expect((await techB.delete(`/api/time-off/${rows[0].id}`)).status).toBe(404);
    const res = await tech.delete(`/api/time-off/${rows[0].id}`);
    expect(res.status).toBe(200);
    expect((await db().select().from(timeOff).where(eq(timeOff.userId, w.people.technician.id))).length).toBe(rows.length - 1);
  });
});
