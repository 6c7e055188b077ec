import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, makeSite, world } from '../support/factories';
import { bikes, sessions } from '../../server/db/schema';

const clock = manualClock('2026-06-15T10:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
const as: Record<string, Agent> = {};

beforeAll(async () => {
  t = await testApp({ now: clock.now });
  w = await world(t.database.db);
  await makeServiceItem(t.database.db, w.model.id, { name: 'Engine oil' });
  for (const role of ['admin', 'manager'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
  as.signedOut = await agent(t.app);
  // Some history with every kind of column: readings (doubles, dates), audit entries (jsonb, a sequence).
  const check = await as.manager.post(`/api/bikes/${w.bikeA.id}/check-ins`).send({ odometer: 1234.5, date: '2026-06-01' });
  expect(check.status).toBe(201);
  await as.manager.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'out_of_service', reason: 'Chain "snatch", check sprockets' });
});
afterAll(() => t.close());

// Supertest hands the raw response stream to a custom parser; the body stays bytes.
const binary = (res: unknown, done: (err: Error | null, body: Buffer) => void) => {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
};
const download = (who: Agent, format?: string) => who.get(`/api/admin/backup${format ? `?format=${format}` : ''}`).buffer(true).parse(binary);
const upload = (who: Agent, file: Buffer) => who.post('/api/admin/restore').set('content-type', 'application/octet-stream').send(file);

/** Row count and an md5 over the rows in a fixed order, per table: sessions aside, and the backup and restore entries themselves aside. */
// The data version counter is not data: every write, a restore's included, moves it on.
async function fingerprint() {
  const { rows } = (await t.database.db.execute(sql`select tablename from pg_tables where schemaname = 'public' and tablename not in ('sessions', 'data_versions') order by 1`)) as unknown as { rows: { tablename: string }[] };
  const out: Record<string, { n: number; md5: string }> = {};
  for (const { tablename } of rows) {
    const where = tablename === 'audit_log' ? `where action not in ('backup', 'restore')` : '';
    const r = (await t.database.db.execute(
      sql.raw(`select count(*)::int as n, md5(coalesce(string_agg(x::text, '|' order by x::text), '')) as md5 from "${tablename}" x ${where}`),
    )) as unknown as { rows: { n: number; md5: string }[] };
    out[tablename] = { n: Number(r.rows[0].n), md5: r.rows[0].md5 };
  }
  return out;
}

/** Changes that a restore must undo. */
async function scribble() {
  const db = t.database.db;
  await db.delete(bikes).where(eq(bikes.id, w.bikeB.id));
  await makeSite(db, 'Harbour Wall');
  await makeBike(db, w.model.id, w.siteA.id, { fleetNumber: 'SM-99' });
  await as.manager.post(`/api/bikes/${w.bikeA.id}/check-ins`).send({ odometer: 1300, date: '2026-06-10' });
}

async function signInAgain() {
  as.admin = await agent(t.app);
  expect((await as.admin.login(w.people.admin.email, PASSWORD)).status).toBe(200);
}

describe('access', () => {
  it('is for an administrator only', async () => {
    expect((await as.signedOut.get('/api/admin/backup')).status).toBe(401);
    expect((await as.manager.get('/api/admin/backup')).status).toBe(403);
    expect((await upload(as.signedOut, Buffer.from('{}'))).status).toBe(401);
    expect((await upload(as.manager, Buffer.from('{}'))).status).toBe(403);
    expect((await as.admin.get('/api/admin/backup?format=zip')).status).toBe(400);
    // A data directory exists only for the embedded database.
    if (t.database.kind === 'postgres') expect((await as.admin.get('/api/admin/backup?format=data-dir')).status).toBe(400);
  });

  it('refuses a file that is not a backup, and changes nothing', async () => {
    const before = await fingerprint();
    for (const file of [Buffer.from('fleet_number,date\r\n'), Buffer.from('{"format":"other"}'), Buffer.from([0x1f, 0x8b, 1, 2, 3, 4])]) {
      const res = await upload(as.admin, file);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
    expect(await fingerprint()).toEqual(before);
  });
});

describe('backup then restore', () => {
  it('restores the same rows from the default backup (data directory on PGlite, JSON on PostgreSQL)', async () => {
    const before = await fingerprint();
    const res = await download(as.admin);
    expect(res.status).toBe(200);
    const file = res.body as Buffer;
    if (t.database.kind === 'pglite') {
      expect(res.headers['content-type']).toBe('application/gzip');
      expect([file[0], file[1]]).toEqual([0x1f, 0x8b]); // gzip magic number, RFC 1952
    } else expect(res.headers['content-type']).toContain('application/json');
    await scribble();
    expect(await fingerprint()).not.toEqual(before);

    const restored = await upload(as.admin, file);
    expect(restored.status).toBe(200);
    expect(restored.body.signedOut).toBe(true);
    const counts = Object.fromEntries(restored.body.tables.map((x: { name: string; rows: number }) => [x.name, x.rows]));
    expect(counts).toMatchObject({ bikes: before.bikes.n, odometer_readings: before.odometer_readings.n, users: before.users.n });
    expect(await fingerprint()).toEqual(before);
    // Sessions are not restored: everyone, the administrator included, signs in again.
    expect(await t.database.db.select().from(sessions)).toHaveLength(0);
    expect((await as.admin.get('/api/auth/me')).status).toBe(401);
    await signInAgain();
  });

  it('restores the portable JSON dump, and keeps sequences ahead of the restored rows', async () => {
    const before = await fingerprint();
    const res = await download(as.admin, 'json');
    expect(res.status).toBe(200);
    const dump = JSON.parse((res.body as Buffer).toString('utf8'));
    expect(dump).toMatchObject({ format: 'lashline-backup', version: 1 });
    const names = dump.tables.map((x: { name: string }) => x.name);
    // Dependency order: a table comes after the tables it references.
    expect(names.indexOf('sites')).toBeLessThan(names.indexOf('bikes'));
    expect(names.indexOf('bikes')).toBeLessThan(names.indexOf('odometer_readings'));
    expect(names).not.toContain('sessions');
    await scribble();
    const restored = await upload(as.admin, res.body as Buffer);
    expect(restored.status).toBe(200);
    expect(restored.body.format).toBe('json');
    expect(await fingerprint()).toEqual(before);
    await signInAgain();
    // A new audit entry after the restore takes the next id, not one already restored.
    const check = await as.admin.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'in_service' });
    expect(check.status).toBe(200);
  });

  it('refuses a backup whose tables do not match this version, naming them, and changes nothing', async () => {
    const res = await download(as.admin, 'json');
    const dump = JSON.parse((res.body as Buffer).toString('utf8'));
    dump.tables = dump.tables.filter((x: { name: string }) => x.name !== 'defects');
    dump.tables.find((x: { name: string }) => x.name === 'bikes').columns.push({ name: 'colour', type: 'text' });
    const before = await fingerprint();
    const refused = await upload(as.admin, Buffer.from(JSON.stringify(dump)));
    expect(refused.status).toBe(409);
    expect(refused.body.error.details.map((d: { path: string }) => d.path)).toEqual(expect.arrayContaining(['defects', 'bikes.colour']));
    expect(await fingerprint()).toEqual(before);
  });
});
