import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { agent, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, world } from '../support/factories';

let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
const as: Record<string, Agent> = {};
beforeAll(async () => {
  t = await testApp();
  w = await world(t.database.db);
  for (const role of ['admin', 'manager', 'technician', 'desk'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
});
afterAll(() => t.close());

const newBike = (over: Record<string, unknown> = {}) => ({
  fleetNumber: `N-${Math.random().toString(36).slice(2, 8)}`,
  modelId: w.model.id,
  siteId: w.siteA.id,
  inServiceDate: '2025-06-01',
  inServiceOdometer: 12,
  ...over,
});

describe('GET /api/bikes', () => {
  it('is refused signed out', async () => {
    expect((await request(t.app).get('/api/bikes')).status).toBe(401);
  });

  it('lists the fleet of the user’s sites with model, site, status and latest odometer', async () => {
    const res = await as.desk.get('/api/bikes');
    expect(res.status).toBe(200);
    const ids = res.body.items.map((b: { id: string }) => b.id);
    expect(ids).toContain(w.bikeA.id);
    // The desk works at site A only: site B's bike is not theirs to see.
    expect(ids).not.toContain(w.bikeB.id);
    const bike = res.body.items.find((b: { id: string }) => b.id === w.bikeA.id);
    expect(bike).toMatchObject({ model: { id: w.model.id }, site: { id: w.siteA.id }, status: 'in_service', latestOdometer: null });
  });

  it('shows a manager of both sites every bike, and filters', async () => {
    const all = await as.manager.get('/api/bikes');
    expect(all.body.items.map((b: { id: string }) => b.id)).toEqual(expect.arrayContaining([w.bikeA.id, w.bikeB.id]));
    const b = await as.manager.get(`/api/bikes?siteId=${w.siteB.id}`);
    expect(b.body.items.every((x: { site: { id: string } }) => x.site.id === w.siteB.id)).toBe(true);
    const q = await as.manager.get(`/api/bikes?q=${encodeURIComponent(w.bikeA.fleetNumber)}`);
    expect(q.body.items.map((x: { id: string }) => x.id)).toEqual([w.bikeA.id]);
    expect((await as.manager.get('/api/bikes?status=flying')).status).toBe(400);
  });

  it('hides another site’s bike as not found', async () => {
    expect((await as.desk.get(`/api/bikes/${w.bikeB.id}`)).status).toBe(404);
    expect((await as.desk.get('/api/bikes/not-a-uuid')).status).toBe(404);
  });
});

describe('POST /api/bikes', () => {
  it('lets a manager add a bike', async () => {
    const res = await as.manager.post('/api/bikes').send(newBike({ vin: 'sm1ab2cd3ef456789'.toUpperCase() }));
    expect(res.status).toBe(201);
    expect(res.body.bike.vin).toBe('SM1AB2CD3EF456789');
  });

  it('refuses desk and technician (403)', async () => {
    expect((await as.desk.post('/api/bikes').send(newBike())).status).toBe(403);
    expect((await as.technician.post('/api/bikes').send(newBike())).status).toBe(403);
  });

  it('refuses a duplicate fleet number with 409 naming the field', async () => {
    const res = await as.manager.post('/api/bikes').send(newBike({ fleetNumber: w.bikeA.fleetNumber.toLowerCase() }));
    expect(res.status).toBe(409);
    expect(res.body.error.details[0].path).toBe('fleetNumber');
  });

  it('refuses a malformed VIN naming the field (ISO 3779: 17 characters, no I, O or Q)', async () => {
    for (const vin of ['SHORT', 'SM1AB2CD3EF45678O', 'SM1AB2CD3EF4567890']) {
      const res = await as.manager.post('/api/bikes').send(newBike({ vin }));
      expect(res.status).toBe(400);
      expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain('vin');
    }
    // A VIN is optional: older bikes predate the standard.
    expect((await as.manager.post('/api/bikes').send(newBike({ vin: '' }))).status).toBe(201);
  });

  it('refuses an unknown model and a date that does not exist', async () => {
    const res = await as.manager.post('/api/bikes').send(newBike({ modelId: '00000000-0000-4000-8000-000000000000' }));
    expect(res.status).toBe(400);
    expect((await as.manager.post('/api/bikes').send(newBike({ inServiceDate: '2025-02-30' }))).status).toBe(400);
  });
});

describe('bike status', () => {
  it('grounds a bike with a reason and records who did it', async () => {
    const res = await as.technician.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'out_of_service', reason: 'Front brake lever spongy' });
    expect(res.status).toBe(200);
    expect(res.body.bike).toMatchObject({ status: 'out_of_service', statusReason: 'Front brake lever spongy' });
    const noReason = await as.technician.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'out_of_service' });
    expect(noReason.status).toBe(400);
    expect((await as.desk.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'in_service' })).status).toBe(403);
    const back = await as.manager.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'in_service' });
    expect(back.body.bike.statusReason).toBeNull();
  });
});
