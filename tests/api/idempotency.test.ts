import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { count, eq } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, world } from '../support/factories';
import { idempotentRequests, odometerReadings } from '../../server/db/schema';

// The rules follow the IETF draft "The Idempotency-Key HTTP Header Field" (httpapi WG): a repeat
// with the same key and body gets the first answer and changes nothing; the same key with another
// body is refused with 422; a repeat while the first is still being worked on gets 409.
const clock = manualClock('2026-06-15T10:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let bike: { id: string };
const as: Record<string, Agent> = {};
beforeAll(async () => {
  t = await testApp({ now: clock.now });
  w = await world(t.database.db);
  await makeServiceItem(t.database.db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6 });
  bike = await makeBike(t.database.db, w.model.id, w.siteA.id, { inServiceDate: '2026-06-01' });
  for (const role of ['manager', 'desk'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
});
afterAll(() => t.close());

const readings = async () => (await t.database.db.select({ n: count() }).from(odometerReadings).where(eq(odometerReadings.bikeId, bike.id)))[0].n;
const checkIn = (who: Agent, key: string | null, odometer: number, date = '2026-06-15') => {
  const req = who.post(`/api/bikes/${bike.id}/check-ins`);
  if (key !== null) req.set('Idempotency-Key', key);
  return req.send({ odometer, date });
};

describe('Idempotency-Key on unsafe routes', () => {
  it('applies a check-in once: the repeat gets the first answer, marked as replayed', async () => {
    const key = randomUUID();
    const before = await readings();
    const first = await checkIn(as.desk, key, 1200);
    expect(first.status).toBe(201);
    expect(first.headers['idempotent-replayed']).toBeUndefined();
    const again = await checkIn(as.desk, key, 1200);
    expect(again.status).toBe(201);
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(again.headers['content-type']).toMatch(/application\/json/);
    expect(again.body).toEqual(first.body);
    expect(await readings()).toBe(before + 1);
  });

  it('refuses the same key with another body (422), in words, writing nothing', async () => {
    const key = randomUUID();
    expect((await checkIn(as.desk, key, 1300)).status).toBe(201);
    const before = await readings();
    const res = await checkIn(as.desk, key, 1350);
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('key_reused');
    expect(res.body.error.message).toMatch(/different request/);
    expect(await readings()).toBe(before);
  });

  it('keeps keys per person: the same key from someone else is their own request', async () => {
    const key = randomUUID();
    expect((await checkIn(as.desk, key, 1400)).status).toBe(201);
    const other = await checkIn(as.manager, key, 1450);
    expect(other.status).toBe(201);
    expect(other.headers['idempotent-replayed']).toBeUndefined();
    expect(other.body.reading.value).toBe(1450);
  });

  it('replays a refusal as it was given, so a queued change is judged once', async () => {
    const key = randomUUID();
    // Dated before the last check-in: refused by the server's own rule.
    const refused = await checkIn(as.desk, key, 1470, '2026-06-10');
    expect(refused.status).toBe(409);
    const again = await checkIn(as.desk, key, 1470, '2026-06-10');
    expect(again.status).toBe(409);
    expect(again.headers['idempotent-replayed']).toBe('true');
    expect(again.body).toEqual(refused.body);
  });

  it('applies two tries sent at the same moment once: the other is replayed or told to wait', async () => {
    const key = randomUUID();
    const before = await readings();
    const [a, b] = await Promise.all([checkIn(as.desk, key, 1500), checkIn(as.desk, key, 1500)]);
    expect([a.status, b.status].sort()).toEqual(a.status === b.status ? [201, 201] : [201, 409]);
    const late = [a, b].find((r) => r.status === 409);
    if (late) expect(late.body.error.code).toBe('in_progress');
    expect(await readings()).toBe(before + 1);
    // Once the first has answered, a third try is a replay.
    const third = await checkIn(as.desk, key, 1500);
    expect(third.headers['idempotent-replayed']).toBe('true');
    expect(await readings()).toBe(before + 1);
  });

  it('forgets a key after a day', async () => {
    const key = randomUUID();
    expect((await checkIn(as.desk, key, 1600)).status).toBe(201);
    // Stored 25 hours ago (the session would not last that long on the test clock).
    await t.database.db.update(idempotentRequests).set({ createdAt: new Date(clock.now().getTime() - 25 * 3_600_000) }).where(eq(idempotentRequests.key, key));
    const res = await checkIn(as.desk, key, 1650);
    expect(res.status).toBe(201);
    expect(res.headers['idempotent-replayed']).toBeUndefined();
  });

  it('refuses a malformed key in words, and keeps nothing for a request that is not signed in', async () => {
    const bad = await checkIn(as.desk, 'short', 1700);
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/Idempotency-Key/);
    const key = randomUUID();
    const anon = await (await agent(t.app)).post(`/api/bikes/${bike.id}/check-ins`).set('Idempotency-Key', key).send({ odometer: 1700 });
    expect(anon.status).toBeGreaterThanOrEqual(401);
    expect(await t.database.db.select().from(idempotentRequests).where(eq(idempotentRequests.key, key))).toEqual([]);
  });

  it('leaves requests without the header as they were', async () => {
    const before = await readings();
    expect((await checkIn(as.desk, null, 1800)).status).toBe(201);
    expect((await checkIn(as.desk, null, 1810)).status).toBe(201);
    expect(await readings()).toBe(before + 2);
  });
});
