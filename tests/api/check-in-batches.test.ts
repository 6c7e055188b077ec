import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, eq, inArray } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, world } from '../support/factories';
import { auditLog, odometerReadings } from '../../server/db/schema';
import { CheckInQueue } from '../../server/services/check-in-queue';
import { loadSessionUser } from '../../server/services/users';
import type { SessionUser } from '../../shared/schemas/auth';
import { HttpError } from '../../server/http-error';

const clock = manualClock('2026-06-15T10:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let desk: SessionUser;
let deskAgent: Agent;
let managerAgent: Agent;

beforeAll(async () => {
  t = await testApp({ now: clock.now });
  w = await world(t.database.db);
  await makeServiceItem(t.database.db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6 });
  await makeServiceItem(t.database.db, w.model.id, { name: 'Brake check', category: 'brakes', everyKm: 3000, everyMonths: 3, safetyCritical: true });
  desk = (await loadSessionUser(t.database.db, w.people.desk.id))!;
  deskAgent = await agent(t.app);
  await deskAgent.login(w.people.desk.email, PASSWORD);
  managerAgent = await agent(t.app);
  await managerAgent.login(w.people.manager.email, PASSWORD);
});
afterAll(() => t.close());

const fleet = (n: number) => Promise.all(Array.from({ length: n }, () => makeBike(t.database.db, w.model.id, w.siteA.id, { inServiceDate: '2026-06-01' })));
const readingsOf = async (ids: string[]) => (await t.database.db.select({ n: count() }).from(odometerReadings).where(inArray(odometerReadings.bikeId, ids)))[0].n;

describe('check-ins written in batches', () => {
  it('writes readings that arrive together in one batch, each judged as on its own', async () => {
    const bikes = await fleet(12);
    const queue = new CheckInQueue(t.database.db, clock.now);
    const answers = await Promise.all(bikes.map((b, i) => queue.record(desk, b.id, { odometer: 100 + i })));
    expect(queue.stats).toEqual({ batches: 1, largest: 12 });
    expect(answers.map((a) => a.reading.value)).toEqual(bikes.map((_, i) => 100 + i));
    expect(answers.every((a, i) => a.bike.id === bikes[i].id && a.bike.latestOdometer === 100 + i)).toBe(true);
    expect(answers[0].due.map((d) => d.item).sort()).toEqual(['Brake check', 'Engine oil']);
    expect(await readingsOf(bikes.map((b) => b.id))).toBe(12);
    const audits = await t.database.db.select().from(auditLog).where(inArray(auditLog.entityId, bikes.map((b) => b.id)));
    expect(audits.filter((a) => a.action === 'check-in')).toHaveLength(12);
  });

  it('refuses one reading of a batch and keeps the others', async () => {
    const bikes = await fleet(3);
    const queue = new CheckInQueue(t.database.db, clock.now);
    await Promise.all(bikes.map((b) => queue.record(desk, b.id, { odometer: 500, date: '2026-06-10' })));
    const results = await Promise.allSettled([
      queue.record(desk, bikes[0].id, { odometer: 600 }),
      queue.record(desk, bikes[1].id, { odometer: 400 }), // backwards
      queue.record(desk, bikes[2].id, { odometer: 6000 }), // 5,500 km in 5 days, over 1,000 a day: must be confirmed
    ]);
    expect(results[0].status).toBe('fulfilled');
    const backwards = (results[1] as PromiseRejectedResult).reason as HttpError;
    expect(backwards).toBeInstanceOf(HttpError);
    expect(backwards.status).toBe(409);
    expect(backwards.message).toContain('500 km');
    expect(((results[2] as PromiseRejectedResult).reason as HttpError).code).toBe('needs_confirmation');
    expect(await readingsOf([bikes[0].id])).toBe(2);
    expect(await readingsOf([bikes[1].id, bikes[2].id])).toBe(2);
  });

  it('takes a second reading of the same bike in the next batch, judged against the first', async () => {
    const [bike] = await fleet(1);
    const queue = new CheckInQueue(t.database.db, clock.now);
    await queue.record(desk, bike.id, { odometer: 300, date: '2026-06-12' });
    const [first, second] = await Promise.allSettled([
      queue.record(desk, bike.id, { odometer: 320, date: '2026-06-13' }),
      // Dated before the reading just above: refused, as it would be one at a time.
      queue.record(desk, bike.id, { odometer: 330, date: '2026-06-12' }),
    ]);
    expect(first.status).toBe('fulfilled');
    expect(((second as PromiseRejectedResult).reason as HttpError).message).toMatch(/last check-in is dated 13 Jun 2026/);
    expect(queue.stats.batches).toBe(3);
  });

  it('answers 20 check-ins at once over the API with what each bike page shows', async () => {
    const bikes = await fleet(20);
    const res = await Promise.all(bikes.map((b, i) => deskAgent.post(`/api/bikes/${b.id}/check-ins`).send({ odometer: 3000 + i, date: '2026-06-14' })));
    expect(res.map((r) => r.status)).toEqual(bikes.map(() => 201));
    for (const [i, b] of bikes.entries()) {
      const page = await managerAgent.get(`/api/bikes/${b.id}`);
      expect(res[i].body.due).toEqual(page.body.due);
      expect(res[i].body.bike).toEqual(page.body.bike);
    }
    // 3,000 km or more: the brake check is overdue, a task is raised and shown in the answer.
    expect(res[0].body.due[0]).toMatchObject({ item: 'Brake check', status: 'overdue' });
    expect(res[0].body.due[0].taskId).toBeTruthy();
    expect(res[0].body.ride.mayRide).toBe(false);
  });

  it('refuses another site’s bike inside a batch without writing it', async () => {
    const [mine] = await fleet(1);
    const queue = new CheckInQueue(t.database.db, clock.now);
    const [ok, theirs] = await Promise.allSettled([queue.record(desk, mine.id, { odometer: 10 }), queue.record(desk, w.bikeB.id, { odometer: 10 })]);
    expect(ok.status).toBe('fulfilled');
    expect(((theirs as PromiseRejectedResult).reason as HttpError).status).toBe(404);
    expect(await t.database.db.select().from(odometerReadings).where(eq(odometerReadings.bikeId, w.bikeB.id))).toEqual([]);
  });
});
