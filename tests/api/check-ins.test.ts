import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { count, eq } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, world } from '../support/factories';
import { bikes, odometerReadings, outbox } from '../../server/db/schema';

const clock = manualClock('2026-06-15T10:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let bike: { id: string };
const as: Record<string, Agent> = {};
beforeAll(async () => {
  t = await testApp({ now: clock.now });
  w = await world(t.database.db);
  await makeServiceItem(t.database.db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6 });
  await makeServiceItem(t.database.db, w.model.id, { name: 'Brake check', category: 'brakes', everyKm: 3000, everyMonths: 3, safetyCritical: true });
  bike = await makeBike(t.database.db, w.model.id, w.siteA.id, { inServiceDate: '2026-06-01' });
  for (const role of ['manager', 'technician', 'desk'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
});
afterAll(() => t.close());

const readingsOf = async (bikeId: string) =>
  (await t.database.db.select({ n: count() }).from(odometerReadings).where(eq(odometerReadings.bikeId, bikeId)))[0].n;

describe('POST /api/bikes/:id/check-ins', () => {
  it('records the odometer and answers with the bike’s due items', async () => {
    const res = await as.desk.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 1200, date: '2026-06-10' });
    expect(res.status).toBe(201);
    expect(res.body.reading).toMatchObject({ value: 1200, unit: 'km', odometerKm: 1200, date: '2026-06-10' });
    expect(res.body.due.map((d: { item: string }) => d.item).sort()).toEqual(['Brake check', 'Engine oil']);
    expect(res.body.ride).toEqual({ mayRide: true, reasons: [] });
  });

  it("answers with the same due items, tasks and order as the bike's own page", async () => {
    const other = await makeBike(t.database.db, w.model.id, w.siteA.id, { inServiceDate: '2026-01-10' });
    // 3,100 km: the brake check (every 3,000 km) is overdue and gets a task; the oil is soon or fine.
    const res = await as.desk.post(`/api/bikes/${other.id}/check-ins`).send({ odometer: 3100, date: '2026-06-10' });
    expect(res.status).toBe(201);
    const page = await as.manager.get(`/api/bikes/${other.id}`);
    expect(res.body.due).toEqual(page.body.due);
    expect(res.body.due[0]).toMatchObject({ item: 'Brake check', status: 'overdue' });
    expect(res.body.due[0].taskId).toBeTruthy();
  });

  it('refuses an odometer lower than the last, showing the last value, and stores nothing', async () => {
    const before = await readingsOf(bike.id);
    const res = await as.desk.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 1100 });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain('1,200 km');
    expect(res.body.error.details[0].path).toBe('odometer');
    expect(await readingsOf(bike.id)).toBe(before);
  });

  it('refuses a date in the future (the site’s calendar)', async () => {
    const res = await as.desk.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 1300, date: '2026-06-16' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('date');
  });

  it('asks to confirm a jump of more than 1,000 km a day', async () => {
    const first = await as.desk.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 9000, date: '2026-06-11' });
    expect(first.status).toBe(409);
    expect(first.body.error.code).toBe('needs_confirmation');
    const confirmed = await as.desk.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 9000, date: '2026-06-11', confirmLargeJump: true });
    expect(confirmed.status).toBe(201);
  });

  it('lets only a technician or manager record a replaced odometer, and distance keeps adding up', async () => {
    expect((await as.desk.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 5, reset: true })).status).toBe(403);
    const reset = await as.technician.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 5, reset: true, date: '2026-06-12' });
    expect(reset.status).toBe(201);
    expect(reset.body.reading.odometerKm).toBe(9000);
    const after = await as.desk.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 105, date: '2026-06-13' });
    expect(after.status).toBe(201);
    expect(after.body.reading.odometerKm).toBe(9100);
    expect(after.body.bike.latestOdometer).toBe(105);
  });

  it('stores a miles odometer in miles and reasons in km (1 mile = 1.609344 km exactly, 1959 agreement)', async () => {
    const miles = await makeBike(t.database.db, w.model.id, w.siteA.id, { odometerUnit: 'mi', inServiceOdometer: 0 });
    const res = await as.desk.post(`/api/bikes/${miles.id}/check-ins`).send({ odometer: 100, date: '2026-06-14' });
    expect(res.status).toBe(201);
    expect(res.body.reading).toMatchObject({ value: 100, unit: 'mi' });
    expect(res.body.reading.odometerKm).toBeCloseTo(160.9344, 9);
  });

  it('grounds the bike at once on a safety-critical defect and tells the manager', async () => {
    const other = await makeBike(t.database.db, w.model.id, w.siteA.id, { inServiceDate: '2026-06-01' });
    const res = await as.desk
      .post(`/api/bikes/${other.id}/check-ins`)
      .send({ odometer: 300, defect: { category: 'brakes', text: 'Front brake lever reaches the bar <b>fast</b>', safetyCritical: true } });
    expect(res.status).toBe(201);
    expect(res.body.grounded).toBe(true);
    expect(res.body.ride.mayRide).toBe(false);
    const [row] = await t.database.db.select().from(bikes).where(eq(bikes.id, other.id));
    expect(row.status).toBe('out_of_service');
    expect(row.statusReason).toContain('Front brake lever');
    const mails = await t.database.db.select().from(outbox);
    const mail = mails.find((m) => m.to === w.people.manager.email && m.subject.includes(other.fleetNumber));
    expect(mail).toBeDefined();
    // What a rider typed reaches the HTML part as text, never as markup.
    expect(mail!.html).toContain('&#60;b&#62;fast&#60;/b&#62;');
    expect(mail!.html).not.toContain('<b>fast');
  });

  it('takes 50 concurrent check-ins on one bike: none refused, the highest kept, no row lost', async () => {
    const busy = await makeBike(t.database.db, w.model.id, w.siteA.id, { inServiceDate: '2026-06-01' });
    await as.desk.post(`/api/bikes/${busy.id}/check-ins`).send({ odometer: 100, date: '2026-06-14' });
    const results = await Promise.all(
      Array.from({ length: 50 }, (_, i) => as.desk.post(`/api/bikes/${busy.id}/check-ins`).send({ odometer: 110 + i })),
    );
    expect(results.map((r) => r.status).filter((s) => s !== 201)).toEqual([]);
    expect(await readingsOf(busy.id)).toBe(51);
    const bikeNow = (await as.desk.get(`/api/bikes/${busy.id}`)).body.bike;
    expect(bikeNow.latestOdometer).toBe(159);
  });

  it('refuses signed out, another site’s bike, and a malformed body', async () => {
    expect((await request(t.app).post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 1 })).status).toBe(403);
    expect((await as.desk.post(`/api/bikes/${w.bikeB.id}/check-ins`).send({ odometer: 99999 })).status).toBe(404);
    const bad = await as.desk.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 'lots' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('odometer');
  });
});
