import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, world } from '../support/factories';
import { bikes, dueStates, serviceItems } from '../../server/db/schema';

const clock = manualClock('2026-06-15T09:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let manager: Agent;
beforeAll(async () => {
  t = await testApp({ now: clock.now });
  w = await world(t.database.db);
  manager = await agent(t.app);
  await manager.login(w.people.manager.email, PASSWORD);
});
afterAll(() => t.close());

const statesOf = async (where: ReturnType<typeof eq>) => (await t.database.db.select().from(dueStates).where(where)).length;

describe('due states of a bike or service item that is deleted', () => {
  it('go with the bike, and with the service item, as a cascade would', async () => {
    const oil = await makeServiceItem(t.database.db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6 });
    const chain = await makeServiceItem(t.database.db, w.model.id, { name: 'Chain', everyKm: 1000, everyMonths: 3 });
    const kept = await makeBike(t.database.db, w.model.id, w.siteA.id);
    const gone = await makeBike(t.database.db, w.model.id, w.siteA.id);
    for (const b of [kept, gone]) expect((await manager.post(`/api/bikes/${b.id}/check-ins`).send({ odometer: 1200 })).status).toBe(201);
    expect(await statesOf(eq(dueStates.bikeId, gone.id))).toBeGreaterThanOrEqual(2);
    // The check-ins' re-plans finish first: the deletes below are the test, not a race with them.
    await t.settled();

    await t.database.db.delete(bikes).where(eq(bikes.id, gone.id));
    expect(await statesOf(eq(dueStates.bikeId, gone.id))).toBe(0);
    expect(await statesOf(eq(dueStates.bikeId, kept.id))).toBeGreaterThanOrEqual(2);

    await t.database.db.delete(serviceItems).where(eq(serviceItems.id, chain.id));
    expect(await statesOf(eq(dueStates.serviceItemId, chain.id))).toBe(0);
    expect(await statesOf(eq(dueStates.serviceItemId, oil.id))).toBeGreaterThanOrEqual(1);
    // Nothing anywhere points at a bike or item that is not there.
    const orphans = await t.database.db.execute(sql`
      select count(*)::int as n from due_states d
       where not exists (select 1 from bikes b where b.id = d.bike_id)
          or not exists (select 1 from service_items i where i.id = d.service_item_id)`);
    expect((orphans as unknown as { rows: { n: number }[] }).rows[0].n).toBe(0);
  });
});
