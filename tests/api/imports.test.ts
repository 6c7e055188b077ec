import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, eq, inArray, sql } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, makeUser, world } from '../support/factories';
import { auditLog, bikes, dueStates, odometerReadings } from '../../server/db/schema';

const clock = manualClock('2026-06-15T10:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
const as: Record<string, Agent> = {};
const CRLF = '\r\n';
const BIKE_HEADER = 'fleet_number,registration,vin,model,site,odometer_unit,in_service_date,in_service_odometer';

beforeAll(async () => {
  t = await testApp({ now: clock.now });
  const db = t.database.db;
  w = await world(db);
  await makeServiceItem(db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6 });
  const managerA = await makeUser(db, 'manager', [w.siteA.id]);
  for (const [name, email] of [['manager', w.people.manager.email], ['managerA', managerA.email], ['desk', w.people.desk.email], ['technician', w.people.technician.email]] as const) {
    as[name] = await agent(t.app);
    await as[name].login(email, PASSWORD);
  }
  as.signedOut = await agent(t.app);
});
afterAll(() => t.close());

const csv = (...lines: string[]) => lines.join(CRLF) + CRLF;
const post = (who: string, url: string, text: string) => as[who].post(url).set('content-type', 'text/csv').send(text);
const rows = async (table: typeof bikes | typeof odometerReadings | typeof dueStates | typeof auditLog) => (await t.database.db.select({ n: count() }).from(table))[0].n;
const fieldsByLine = (body: { rows: { line: number; errors: { field: string }[] }[] }) =>
  Object.fromEntries(body.rows.map((r) => [r.line, r.errors.map((e) => e.field)]));

describe('access and input', () => {
  it('refuses signed out (401), a desk or technician (403), an unknown kind (404) and a file without its columns (400)', async () => {
    const body = csv(BIKE_HEADER);
    expect((await post('signedOut', '/api/import/bikes/preview', body)).status).toBe(401);
    expect((await post('desk', '/api/import/bikes/preview', body)).status).toBe(403);
    expect((await post('technician', '/api/import/readings', body)).status).toBe(403);
    expect((await post('manager', '/api/import/cars/preview', body)).status).toBe(404);
    const missing = await post('manager', '/api/import/readings/preview', csv('fleet_number,date', 'SM-01,2026-06-01'));
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toContain('odometer');
    expect((await post('manager', '/api/import/bikes/preview', csv(BIKE_HEADER))).status).toBe(400);
    expect((await as.manager.post('/api/import/bikes/preview').send({ csv: 42 })).status).toBe(400);
  });

  it('takes the file as JSON { csv } too, and refuses one over 5 MB', async () => {
    const res = await as.manager.post('/api/import/readings/preview').send({ csv: csv('fleet_number,date,odometer', `${w.bikeA.fleetNumber},2026-06-01,10`) });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ valid: 1, invalid: 0 });
    const big = `fleet_number,date,odometer${CRLF}${'x'.repeat(5 * 1024 * 1024 + 10)}`;
    expect((await post('manager', '/api/import/readings/preview', big)).status).toBe(413);
  });
});

describe('bikes', () => {
  const file = () =>
    csv(
      BIKE_HEADER,
      `SM-40,SM26 AAA,SMH0A1B2C3D4E5F67,${w.model.name},${w.siteA.name},km,2026-03-01,12`, // 2: fine
      `SM-41,,,No Such Model,${w.siteA.name},km,2026-03-01,0`, // 3: model
      `SM-42,,,${w.model.name},Nowhere,km,2026-03-01,0`, // 4: site
      `SM-43,,,${w.model.name},${w.siteA.name},km,2026-03-01,0`, // 5: duplicate of 6
      `sm-43,,,${w.model.name},${w.siteA.name},km,2026-03-01,0`, // 6: duplicate of 5
      `${w.bikeA.fleetNumber},,,${w.model.name},${w.siteA.name},km,2026-03-01,0`, // 7: already in the fleet
      `SM-44,,SMH0A1B2C3D4E5FI7,${w.model.name},${w.siteA.name},km,2026-03-01,0`, // 8: VIN with I (ISO 3779)
      `SM-45,,,${w.model.name},${w.siteA.name},km,2026-02-29,0`, // 9: 2026 is not a leap year
      `SM-46,,,${w.model.name},${w.siteA.name},km,2026-06-16,0`, // 10: after today
      `SM-47,"SM26, B""B""",,${w.model.name},${w.siteB.name},mi,2026-03-01,100`, // 11: site B (fine for a manager of both)
    );

  it('previews every row with its errors and writes nothing', async () => {
    const before = await rows(bikes);
    const res = await post('manager', '/api/import/bikes/preview', file());
    expect(res.status).toBe(200);
    expect(fieldsByLine(res.body)).toEqual({
      2: [], 3: ['model'], 4: ['site'], 5: ['fleet_number'], 6: ['fleet_number'], 7: ['fleet_number'],
      8: ['vin'], 9: ['in_service_date'], 10: ['in_service_date'], 11: [],
    });
    expect(res.body).toMatchObject({ valid: 2, invalid: 8 });
    expect(res.body.rows[9].data.registration).toBe('SM26, B"B"');
    expect(await rows(bikes)).toBe(before);
  });

  it('tells a manager of one site that another site is not theirs', async () => {
    const res = await post('managerA', '/api/import/bikes/preview', file());
    expect(fieldsByLine(res.body)[11]).toEqual(['site']);
    expect(res.body.rows[9].errors[0].message).toContain('not one of your sites');
  });

  it('imports the valid rows, reports the others, and computes their due items', async () => {
    const res = await post('manager', '/api/import/bikes', file());
    expect(res.status).toBe(200);
    expect(res.body.imported).toBe(2);
    expect(res.body.skipped.map((s: { line: number }) => s.line)).toEqual([3, 4, 5, 6, 7, 8, 9, 10]);
    const added = await t.database.db.select().from(bikes).where(inArray(bikes.fleetNumber, ['SM-40', 'SM-47']));
    expect(added.map((b) => [b.fleetNumber, b.vin, b.odometerUnit, b.inServiceOdometer]).sort()).toEqual([
      ['SM-40', 'SMH0A1B2C3D4E5F67', 'km', 12],
      ['SM-47', null, 'mi', 100],
    ]);
    const dues = await t.database.db.select().from(dueStates).where(inArray(dueStates.bikeId, added.map((b) => b.id)));
    expect(dues).toHaveLength(2);
    const [entry] = await t.database.db.select().from(auditLog).where(eq(auditLog.action, 'import'));
    expect(entry.entity).toBe('bike');
    // The same file again: every row now clashes with the fleet or the file.
    expect((await post('manager', '/api/import/bikes', file())).body.imported).toBe(0);
  });
});

describe('readings', () => {
  const header = 'fleet_number,date,odometer';
  it('previews backwards readings against the fleet and earlier rows, future dates and another site’s bike', async () => {
    const bike = await makeBike(t.database.db, w.model.id, w.siteA.id, { fleetNumber: 'SM-60', inServiceDate: '2026-01-01' });
    const checkIn = await as.manager.post(`/api/bikes/${bike.id}/check-ins`).send({ odometer: 1000, date: '2026-05-01' });
    expect(checkIn.status).toBe(201);
    const res = await post(
      'managerA',
      '/api/import/readings/preview',
      csv(
        header,
        'SM-60,2026-05-20,1600', // 2: fine, after line 3 by date
        'SM-60,2026-05-10,1200', // 3: fine
        'SM-60,2026-05-15,1100', // 4: below line 3 (earlier in the file, earlier by date)
        'SM-60,2026-05-02,900', // 5: below the fleet's 1,000 km on 1 May
        'SM-60,2026-06-16,1700', // 6: after today
        `${w.bikeB.fleetNumber},2026-05-01,10`, // 7: site B, not this manager's
        'SM-99,2026-05-01,10', // 8: no such bike
      ),
    );
    expect(res.status).toBe(200);
    expect(fieldsByLine(res.body)).toEqual({ 2: [], 3: [], 4: ['odometer'], 5: ['odometer'], 6: ['date'], 7: ['fleet_number'], 8: ['fleet_number'] });
    expect(res.body.rows[2].errors[0].message).toContain('line 3');
    expect(res.body.rows[3].errors[0].message).toContain('1000 km');
  });

  it('imports all or nothing: a failure part-way through leaves no reading, due item or audit entry behind', async () => {
    const bike = await makeBike(t.database.db, w.model.id, w.siteA.id, { fleetNumber: 'SM-61', inServiceDate: '2017-12-01' });
    const lines = Array.from({ length: 3000 }, (_, i) => `SM-61,${day(i)},${i === 2500 ? 26000.5 : 1000 + i * 10}`);
    // The database itself refuses one row of the third 1,000-row batch, after two batches went in.
    await t.database.db.execute(sql.raw(`create function refuse_one() returns trigger language plpgsql as $$ begin if new.value = 26000.5 then raise exception 'refused'; end if; return new; end $$`));
    await t.database.db.execute(sql.raw(`create trigger refuse_one before insert on odometer_readings for each row execute function refuse_one()`));
    const before = { readings: await rows(odometerReadings), dues: await rows(dueStates), audit: await rows(auditLog) };
    try {
      const res = await post('manager', '/api/import/readings', csv(header, ...lines));
      expect(res.status).toBe(500);
    } finally {
      await t.database.db.execute(sql.raw('drop trigger refuse_one on odometer_readings'));
      await t.database.db.execute(sql.raw('drop function refuse_one()'));
    }
    expect({ readings: await rows(odometerReadings), dues: await rows(dueStates), audit: await rows(auditLog) }).toEqual(before);
    expect(await t.database.db.select().from(dueStates).where(eq(dueStates.bikeId, bike.id))).toHaveLength(0);
  });

  it('imports 5,000 readings in one request, continuous km across a replaced odometer and in miles', async () => {
    const db = t.database.db;
    const fleet = await Promise.all(
      ['SM-70', 'SM-71', 'SM-72', 'SM-73', 'SM-74'].map((n, i) => makeBike(db, w.model.id, w.siteA.id, { fleetNumber: n, inServiceDate: '2017-12-01', odometerUnit: i === 4 ? 'mi' : 'km' })),
    );
    // SM-73's odometer was replaced at 20,000 km, the new one starting at 0.
    await db.insert(odometerReadings).values([
      { bikeId: fleet[3].id, date: '2017-12-02', value: 20_000, unit: 'km', odometerKm: 20_000 },
      { bikeId: fleet[3].id, date: '2017-12-03', value: 0, unit: 'km', odometerKm: 20_000, reset: true },
    ]);
    const lines = fleet.flatMap((b) => Array.from({ length: 1000 }, (_, i) => `${b.fleetNumber},${day(i)},${(i + 1) * 40}`));
    const started = performance.now();
    const res = await post('manager', '/api/import/readings', csv(header, ...lines.reverse()));
    const ms = performance.now() - started;
    console.log(`5,000 readings imported in ${Math.round(ms)} ms (${t.database.kind})`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ imported: 5000, skipped: [], bikes: 5 });
    const top = async (id: string) => (await db.select().from(odometerReadings).where(eq(odometerReadings.bikeId, id)).orderBy(sql`${odometerReadings.odometerKm} desc`).limit(1))[0];
    expect((await top(fleet[0].id)).odometerKm).toBe(40_000);
    expect((await top(fleet[3].id)).odometerKm).toBe(60_000);
    // 1 mile = 1.609344 km exactly (international yard and pound agreement, 1959).
    expect((await top(fleet[4].id)).odometerKm).toBeCloseTo(40_000 * 1.609344, 6);
    const [due] = await db.select().from(dueStates).where(eq(dueStates.bikeId, fleet[3].id));
    expect(due.currentKm).toBe(60_000);
  });
});

/** Consecutive days from 1 January 2018: 3,000 of them end in March 2026, before today. */
function day(i: number) {
  return new Date(Date.UTC(2018, 0, 1 + i)).toISOString().slice(0, 10);
}
