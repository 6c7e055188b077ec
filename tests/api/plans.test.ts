import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, world } from '../support/factories';
import { bikes, odometerReadings, outbox, serviceTasks } from '../../server/db/schema';
import { DEFAULT_LIMITS } from '../../shared/domain/limits';

const clock = manualClock('2026-06-15T09:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
const as: Record<string, Agent> = {};
beforeAll(async () => {
  t = await testApp({ now: clock.now });
  w = await world(t.database.db);
  for (const role of ['manager', 'technician', 'desk'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
});
afterAll(() => t.close());

const model = (over: Record<string, unknown> = {}) => ({
  name: `Plan model ${Math.random().toString(36).slice(2, 7)}`,
  cylinders: 1,
  intakeValvesPerCylinder: 2,
  exhaustValvesPerCylinder: 2,
  adjuster: 'shim-under-bucket',
  intakeMinMm: 0.1,
  intakeMaxMm: 0.15,
  exhaustMinMm: 0.17,
  exhaustMaxMm: 0.22,
  shimMinMm: 1.2,
  shimMaxMm: 3.5,
  shimStepMm: 0.05,
  ...over,
});

describe('models and service plans', () => {
  it('validates the engine: spec min below max, shim range in whole steps', async () => {
    const bad = await as.manager.post('/api/models').send(model({ intakeMinMm: 0.2, intakeMaxMm: 0.15 }));
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('intakeMaxMm');
    const steps = await as.manager.post('/api/models').send(model({ shimMaxMm: 3.52 }));
    expect(steps.status).toBe(400);
    expect(steps.body.error.details[0].path).toBe('shimStepMm');
    expect((await as.desk.post('/api/models').send(model())).status).toBe(403);
    const ok = await as.manager.post('/api/models').send(model());
    expect(ok.status).toBe(201);
    expect(ok.body.model).toMatchObject({ intakeMinMm: 0.1, shimStepMm: 0.05 });
  });

  it('needs an interval, checks the calendar rule, and says the rule in plain words (rrule toText)', async () => {
    const m = (await as.manager.post('/api/models').send(model())).body.model;
    const none = await as.manager.post(`/api/models/${m.id}/items`).send({ name: 'Nothing', category: 'other' });
    expect(none.status).toBe(400);
    const badRule = await as.manager.post(`/api/models/${m.id}/items`).send({ name: 'Bad', category: 'inspection', rrule: 'FREQ=SOMETIMES' });
    expect(badRule.status).toBe(400);
    expect(badRule.body.error.details[0].path).toBe('rrule');
    const ok = await as.manager.post(`/api/models/${m.id}/items`).send({ name: 'Pre-season', category: 'inspection', rrule: 'FREQ=YEARLY;BYMONTH=3;BYMONTHDAY=1', safetyCritical: true });
    expect(ok.status).toBe(201);
    expect(ok.body.items[0].ruleText).toBe('every March on the 1st');
  });

  it('moves the dues of every bike of the model when the plan changes', async () => {
    const m = (await as.manager.post('/api/models').send(model())).body.model;
    const item = (await as.manager.post(`/api/models/${m.id}/items`).send({ name: 'Engine oil', category: 'oil', everyKm: 5000, everyMonths: 12 })).body.id;
    const bike = await makeBike(t.database.db, m.id, w.siteA.id, { inServiceDate: '2026-06-01' });
    await t.database.db.insert(odometerReadings).values({ bikeId: bike.id, date: '2026-06-14', value: 1000, unit: 'km', odometerKm: 1000 });
    await as.manager.put(`/api/models/${m.id}/items/${item}`).send({ name: 'Engine oil', category: 'oil', everyKm: 5000, everyMonths: 12 });
    const before = (await as.manager.get(`/api/bikes/${bike.id}`)).body.due.find((d: { item: string }) => d.item === 'Engine oil');
    expect(before.remainingKm).toBe(4000);
    const res = await as.manager.put(`/api/models/${m.id}/items/${item}`).send({ name: 'Engine oil', category: 'oil', everyKm: 3000, everyMonths: 12 });
    expect(res.body.bikesRecomputed).toBe(1);
    const after = (await as.manager.get(`/api/bikes/${bike.id}`)).body.due.find((d: { item: string }) => d.item === 'Engine oil');
    expect(after.remainingKm).toBe(2000);
  });
});

describe('readings with limits on a service', () => {
  it('grounds the bike at once when a safety-critical reading is below its limit, and tells the manager', async () => {
    const m = (await as.manager.post('/api/models').send(model())).body.model;
    const created = await as.manager.post(`/api/models/${m.id}/items`).send({
      name: 'Brakes and tyres',
      category: 'brakes',
      everyKm: 3000,
      everyMonths: 3,
      safetyCritical: true,
      readings: [
        // Great Britain's 1 mm minimum for motorcycles over 50 cc (Construction and Use Regulations 1986, reg. 27(1)(g)(ii)).
        { label: 'Rear tyre tread', kind: 'measure', unit: 'mm', min: DEFAULT_LIMITS.tyreTreadMinMm, safetyCritical: true },
        { label: 'Front pads', kind: 'measure', unit: 'mm', min: DEFAULT_LIMITS.brakePadMinMm, safetyCritical: true },
        { label: 'Lights work', kind: 'check' },
      ],
    });
    expect(created.status).toBe(201);
    const item = created.body.items[0];
    const bike = await makeBike(t.database.db, m.id, w.siteA.id, { inServiceDate: '2026-06-01' });
    const [task] = await t.database.db.insert(serviceTasks).values({ bikeId: bike.id, serviceItemId: item.id, cycleKey: 'test' }).returning();
    const card = await as.technician.get(`/api/tasks/${task.id}`);
    expect(card.body.readings.map((r: { label: string }) => r.label)).toEqual(['Rear tyre tread', 'Front pads', 'Lights work']);
    const [tread, pads, lights] = item.readings;
    const missing = await as.technician.post(`/api/tasks/${task.id}/close`).send({ version: task.version, readings: [{ templateId: tread.id, value: 3 }] });
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toContain('Front pads');
    const res = await as.technician.post(`/api/tasks/${task.id}/close`).send({
      version: task.version,
      readings: [{ templateId: tread.id, value: 0.8 }, { templateId: pads.id, value: 2.5 }, { templateId: lights.id, done: true }],
    });
    expect(res.status).toBe(200);
    expect(res.body.grounded).toBe(true);
    const [row] = await t.database.db.select().from(bikes).where(eq(bikes.id, bike.id));
    expect(row.status).toBe('out_of_service');
    expect(row.statusReason).toContain('Rear tyre tread 0.8 mm');
    const ride = (await as.desk.get(`/api/bikes/${bike.id}`)).body.ride;
    expect(ride.mayRide).toBe(false);
    expect((await t.database.db.select().from(outbox)).some((o) => o.subject.includes(bike.fleetNumber))).toBe(true);
  });
});
