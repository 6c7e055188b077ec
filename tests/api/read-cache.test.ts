import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, world } from '../support/factories';
import { ReadCache } from '../../server/cache/read-cache';
import { dueStates, sites, userSites } from '../../server/db/schema';

const clock = manualClock('2026-06-15T18:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let bike: { id: string; fleetNumber: string };
const as: Record<string, Agent> = {};

beforeAll(async () => {
  t = await testApp({ now: clock.now });
  w = await world(t.database.db);
  await makeServiceItem(t.database.db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6 });
  bike = await makeBike(t.database.db, w.model.id, w.siteA.id, { inServiceDate: '2025-12-20' });
  for (const role of ['manager', 'technician', 'technicianB'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
  // First check-in: the bike's states are computed; the oil falls due by the calendar on 20 June, so it is soon.
  expect((await as.manager.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 4990 })).status).toBe(201);
  // The check-in's re-plan runs after the answer; it writes the plan and so moves the data version.
  await t.settled();
});
afterAll(() => t.close());

const oilOf = (body: { items: { bikeId: string; item: string; status: string }[] }) => body.items.find((i) => i.bikeId === bike.id && i.item === 'Engine oil');

describe('cached due list', () => {
  it('answers a repeat from the cache, and 304 when the browser holds the same body', async () => {
    const first = await as.manager.get('/api/due?within=7');
    expect(first.status).toBe(200);
    expect(oilOf(first.body)?.status).toBe('soon');
    const again = await as.manager.get('/api/due?within=7');
    expect(again.headers['x-lashline-cache']).toBe('hit');
    expect(again.body).toEqual(first.body);
    const etag = again.headers.etag;
    expect(etag).toMatch(/^W\/"/);
    const unchanged = await as.manager.raw.get('/api/due?within=7').set('If-None-Match', etag);
    expect(unchanged.status).toBe(304);
    expect(unchanged.text).toBe('');
  });

  it('sends the cached answer gzipped to a browser that accepts it, the same once unpacked', async () => {
    // A few more bikes due soon, so that the answer is worth compressing (over 1 KB).
    for (let i = 0; i < 4; i++) {
      const b = await makeBike(t.database.db, w.model.id, w.siteA.id, { inServiceDate: '2025-12-20' });
      expect((await as.manager.post(`/api/bikes/${b.id}/check-ins`).send({ odometer: 100 + i })).status).toBe(201);
    }
    await t.settled();
    const plain = await as.manager.raw.get('/api/due?within=7').set('Accept-Encoding', 'identity');
    expect(plain.text.length).toBeGreaterThan(1024);
    expect(plain.headers['content-encoding']).toBeUndefined();
    const packed = await as.manager.raw.get('/api/due?within=7').set('Accept-Encoding', 'gzip, deflate, br');
    expect(packed.headers['content-encoding']).toBe('gzip');
    expect(packed.headers.vary).toMatch(/Accept-Encoding/);
    expect(packed.body).toEqual(plain.body);
    // The fleet register is cached too, and compressed.
    const fleet = await as.manager.raw.get('/api/bikes').set('Accept-Encoding', 'gzip');
    expect(fleet.status).toBe(200);
    expect(JSON.stringify(fleet.body).length).toBeGreaterThan(1024);
    expect(fleet.headers['content-encoding']).toBe('gzip');
  });

  it('shows a check-in at once: the write moves the data version on', async () => {
    await as.manager.get('/api/due?within=7');
    const before = (await as.manager.get('/api/bikes')).body.items.find((b: { id: string }) => b.id === bike.id);
    expect((await as.manager.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 5010 })).status).toBe(201);
    await t.settled();
    const after = await as.manager.get('/api/due?within=7');
    expect(after.headers['x-lashline-cache']).toBe('miss');
    expect(oilOf(after.body)?.status).toBe('overdue');
    const register = await as.manager.get('/api/bikes');
    expect(register.headers['x-lashline-cache']).toBe('miss');
    expect(register.body.items.find((b: { id: string }) => b.id === bike.id).latestOdometer).toBe(5010);
    expect(before.latestOdometer).toBe(4990);
  });

  it('sees a change written straight to the database, outside the app (another instance, an import)', async () => {
    await as.manager.get('/api/due?within=7');
    await t.database.db.update(dueStates).set({ status: 'soon' }).where(eq(dueStates.bikeId, bike.id));
    const after = await as.manager.get('/api/due?within=7');
    expect(after.headers['x-lashline-cache']).toBe('miss');
    expect(oilOf(after.body)?.status).toBe('soon');
    // Put it back as the app computed it.
    expect((await as.manager.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 5020 })).status).toBe(201);
  });

  it("keeps one person's answer from another with other sites", async () => {
    const a = await as.technician.get('/api/due?within=7');
    const b = await as.technicianB.get('/api/due?within=7');
    expect(oilOf(a.body)).toBeDefined();
    expect(oilOf(b.body)).toBeUndefined();
    expect(b.body.items.every((i: { siteId: string }) => i.siteId === w.siteB.id)).toBe(true);
  });

  it('moves to the next day when the clock passes a site’s midnight, with no write at all', async () => {
    const before = await as.manager.get('/api/due?within=7');
    // 23:30 UTC is 00:30 on 16 June in London (BST): a new day at the site, no data changed.
    clock.set('2026-06-15T23:30:00Z');
    const after = await as.manager.get('/api/due?within=7');
    expect(after.headers['x-lashline-cache']).toBe('miss');
    expect(after.body.today).not.toBe(before.body.today);
    clock.set('2026-06-15T18:00:00Z');
  });
});

describe('cached valve answers', () => {
  it('stay cached through check-ins, and move on with anything valve trends are made of', async () => {
    await as.manager.get('/api/valves/warnings');
    expect((await as.manager.get('/api/valves/warnings')).headers['x-lashline-cache']).toBe('hit');
    expect((await as.manager.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 5100 })).status).toBe(201);
    await t.settled();
    // A check-in changes no clearance, no valve service and no plan.
    expect((await as.manager.get('/api/valves/warnings')).headers['x-lashline-cache']).toBe('hit');
    // Grounded and back in service, as scans and check-ins do: trends are made of neither.
    await t.database.db.execute(sql`update bikes set status = 'out_of_service' where id = ${bike.id}`);
    await t.database.db.execute(sql`update bikes set status = 'in_service' where id = ${bike.id}`);
    expect((await as.manager.get('/api/valves/warnings')).headers['x-lashline-cache']).toBe('hit');
    await t.database.db.execute(sql`update bikes set fleet_number = fleet_number || '-R' where id = ${bike.id}`);
    expect((await as.manager.get('/api/valves/warnings')).headers['x-lashline-cache']).toBe('miss');
    await t.database.db.execute(sql`update bikes set status = 'retired' where id = ${bike.id}`);
    expect((await as.manager.get('/api/valves/warnings')).headers['x-lashline-cache']).toBe('miss');
    await t.database.db.execute(sql`update bikes set status = 'in_service', fleet_number = replace(fleet_number, '-R', '') where id = ${bike.id}`);
    await t.database.db.execute(sql`update valve_checks set date = date`);
    expect((await as.manager.get('/api/valves/warnings')).headers['x-lashline-cache']).toBe('miss');
    await t.database.db.execute(sql`update service_records set date = date`);
    expect((await as.manager.get('/api/valves/warnings')).headers['x-lashline-cache']).toBe('miss');
  });
});

describe('cached session person', () => {
  it("sees a change to a person's sites on their next request", async () => {
    const me = async (): Promise<string[]> => (await as.technician.get('/api/auth/me')).body.user.siteIds;
    expect(await me()).toEqual([w.siteA.id]);
    await t.database.db.insert(userSites).values({ userId: w.people.technician.id, siteId: w.siteB.id });
    expect([...(await me())].sort()).toEqual([w.siteA.id, w.siteB.id].sort());
    await t.database.db.delete(userSites).where(and(eq(userSites.userId, w.people.technician.id), eq(userSites.siteId, w.siteB.id)));
    expect(await me()).toEqual([w.siteA.id]);
  });
});

/** A write that never commits. */
const renameASiteAndRollBack = () =>
  expect(
    t.database.db.transaction(async (tx) => {
      await tx.update(sites).set({ name: 'Never' }).where(eq(sites.id, w.siteB.id));
      throw new Error('roll back');
    }),
  ).rejects.toThrow('roll back');

describe('data version', () => {
  it('moves on in the writing transaction, and not when a transaction rolls back', async () => {
    const cache = new ReadCache(t.database.db);
    const v0 = await cache.version();
    const people0 = await cache.version('people');
    await t.database.db.update(sites).set({ name: 'Renamed depot' }).where(eq(sites.id, w.siteB.id));
    const v1 = await cache.version();
    expect(v1).toBeGreaterThan(v0);
    // A site is part of what a signed-in person is (an administrator's sites): both versions move.
    expect(await cache.version('people')).toBeGreaterThan(people0);
    const people1 = await cache.version('people');
    await t.database.db.update(dueStates).set({ status: 'soon' }).where(eq(dueStates.bikeId, bike.id));
    expect(await cache.version()).toBeGreaterThan(v1);
    expect(await cache.version('people')).toBe(people1);
    await t.database.db.update(dueStates).set({ status: 'overdue' }).where(eq(dueStates.bikeId, bike.id));
    await renameASiteAndRollBack();
    expect(await cache.version()).toBe(v1 + 2);
  });

  // On embedded PGlite the server is the database's only user and NOTIFY reaches it as the commit
  // returns (PostgreSQL documentation, NOTIFY: delivered on commit, none on rollback).
  it('on embedded PGlite, reads the versions once until a commit moves them on', async () => {
    if (!t.database.changes) return expect(t.database.kind).toBe('postgres');
    const cache = new ReadCache(t.database.db, { changes: t.database.changes });
    const reads = vi.spyOn(t.database.db, 'execute');
    try {
      const v0 = await cache.version();
      expect(await cache.version()).toBe(v0);
      expect(await cache.version('people')).toBeGreaterThan(0);
      expect(reads).toHaveBeenCalledTimes(1);
      // A write straight on the database, not through the app: seen by the very next read.
      await t.database.pglite!.query(`update sites set name = name`);
      expect(await cache.version()).toBe(v0 + 1);
      expect(reads).toHaveBeenCalledTimes(2);
      await renameASiteAndRollBack();
      expect(await cache.version()).toBe(v0 + 1);
      expect(reads).toHaveBeenCalledTimes(2);
      // The due list of a signed-in person: a change made outside the app is served at once.
      const before = oilOf((await as.manager.get('/api/due?within=7')).body)!.status;
      const other = before === 'soon' ? 'overdue' : 'soon';
      await t.database.pglite!.query(`update due_states set status = $1 where bike_id = $2`, [other, bike.id]);
      const after = await as.manager.get('/api/due?within=7');
      expect(after.headers['x-lashline-cache']).toBe('miss');
      expect(oilOf(after.body)?.status).toBe(other);
      await t.database.pglite!.query(`update due_states set status = $1 where bike_id = $2`, [before, bike.id]);
    } finally {
      reads.mockRestore();
    }
  });

  it('computes a missed answer once for many requests at the same moment', async () => {
    const cache = new ReadCache(t.database.db);
    let runs = 0;
    const compute = async () => {
      runs++;
      await new Promise((r) => setTimeout(r, 20));
      return { runs };
    };
    const answers = await Promise.all(Array.from({ length: 10 }, () => cache.get('k', compute)));
    expect(runs).toBe(1);
    expect(new Set(answers.map((a) => a.body.toString()))).toEqual(new Set(['{"runs":1}']));
    expect((await cache.get('k', compute)).hit).toBe(true);
    await t.database.db.execute(sql`update sites set name = name`);
    expect((await cache.get('k', compute)).hit).toBe(false);
    expect(runs).toBe(2);
  });
});
