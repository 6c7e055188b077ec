import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, request as httpRequest, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import request from 'supertest';
import sharp from 'sharp';
import { createApp } from '../../server/app';
import { openDatabase, type Database } from '../../server/db/client';
import { testConfig } from '../../server/config';
import { createBlobStore } from '../../server/storage';
import { startMailCatcher, type MailCatcher } from '../../server/mail/catcher';
import { createTransport } from '../../server/mail/transport';
import { runScheduled } from '../../jobs';
import { slotClaimer } from '../../jobs/claim';
import { testDatabase } from '../support/test-app';
import { PASSWORD, makeServiceItem, world } from '../support/factories';
import { startFakeS3, type FakeS3 } from '../support/fake-s3';
import { caughtMail, jobRuns, serviceTasks } from '../../server/db/schema';

// Two app instances on one PostgreSQL server behind one address: sessions, scheduled work and
// uploads must behave as if there were one. Only meaningful on a shared server, not embedded PGlite.
const onPostgres = process.env.LASHLINE_TEST_DB === 'postgres';

describe.skipIf(!onPostgres)('two instances behind one address (PostgreSQL)', () => {
  let dbs: Database[] = [];
  let servers: Server[] = [];
  let proxy: Server;
  let base: string;
  let s3: FakeS3;
  let catcher: MailCatcher;
  let w: Awaited<ReturnType<typeof world>>;
  const hits = [0, 0];

  beforeAll(async () => {
    const first = await testDatabase(); // migrated and emptied
    w = await world(first.db);
    await makeServiceItem(first.db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6 });
    dbs = [first, await openDatabase({ databaseUrl: process.env.TEST_DATABASE_URL!, migrate: false })];
    s3 = await startFakeS3();
    catcher = await startMailCatcher(first.db);
    const transport = createTransport(undefined, catcher.port);
    const env = { S3_BUCKET: s3.bucket, S3_ENDPOINT: s3.endpoint, S3_REGION: s3.region, S3_ACCESS_KEY_ID: s3.accessKeyId, S3_SECRET_ACCESS_KEY: s3.secretAccessKey };
    servers = await Promise.all(
      dbs.map(async (database) => {
        const config = testConfig();
        const app = createApp({ database, config, sessionSecret: 'shared-secret-of-the-cluster', blobStore: createBlobStore(env, '/nowhere'), mail: { transport: () => transport, from: config.MAIL_FROM } });
        const s = createServer(app);
        await new Promise<void>((r) => s.listen(0, '127.0.0.1', () => r()));
        return s;
      }),
    );
    // A tiny round-robin proxy: each request goes to the other instance.
    let next = 0;
    proxy = createServer((req, res) => {
      const i = next++ % 2;
      hits[i]++;
      const port = (servers[i].address() as AddressInfo).port;
      const up = httpRequest({ host: '127.0.0.1', port, path: req.url, method: req.method, headers: req.headers }, (r) => {
        res.writeHead(r.statusCode!, r.headers);
        r.pipe(res);
      });
      req.pipe(up);
    });
    await new Promise<void>((r) => proxy.listen(0, '127.0.0.1', () => r()));
    base = `http://127.0.0.1:${(proxy.address() as AddressInfo).port}`;
  });

  afterAll(async () => {
    await new Promise((r) => proxy?.close(r));
    for (const s of servers) await new Promise((r) => s.close(r));
    await catcher?.close();
    await s3?.close();
    for (const d of dbs) await d.close();
  });

  it('keeps a session whichever instance answers', async () => {
    const a = request.agent(base);
    const { token } = (await a.get('/api/auth/csrf')).body;
    const login = await a.post('/api/auth/login').set('x-csrf-token', token).send({ email: w.people.desk.email, password: PASSWORD });
    expect(login.status).toBe(200);
    for (let i = 0; i < 6; i++) expect((await a.get('/api/auth/me')).status).toBe(200);
    expect(hits[0]).toBeGreaterThan(0);
    expect(hits[1]).toBeGreaterThan(0);
    // Uploaded on one instance, served by the other: the store is shared.
    const jpeg = await sharp({ create: { width: 64, height: 48, channels: 3, background: '#445566' } }).jpeg().toBuffer();
    const up = await a.post(`/api/bikes/${w.bikeA.id}/attachments`).set('x-csrf-token', login.body.csrfToken).attach('file', jpeg, { filename: 'tyre.jpg', contentType: 'image/jpeg' });
    expect(up.status).toBe(201);
    const id = up.body.attachment?.id ?? up.body.id;
    for (let i = 0; i < 2; i++) expect((await a.get(`/api/attachments/${id}`)).status).toBe(200);
  });

  it('runs the due scan and the weekly digest once across both instances', async () => {
    const deps = (d: Database) => ({ db: d.db, now: () => new Date('2026-06-15T07:00:30Z'), mail: { transport: () => createTransport(undefined, catcher.port), from: 'x@lashline.test' }, publicUrl: base, log: () => {} });
    const scan = { job: 'due-scan' as const, cron: '30 5 * * *', timeZone: 'Europe/London', catchUp: true };
    const digest = { job: 'weekly-digest' as const, cron: '0 7 * * 1', timeZone: 'Europe/London', catchUp: true };
    const scans = await Promise.all(dbs.map((d, i) => runScheduled(deps(d), scan, slotClaimer(d, `instance-${i}`))));
    expect(scans.filter(Boolean)).toHaveLength(1);
    const digests = await Promise.all(dbs.map((d, i) => runScheduled(deps(d), digest, slotClaimer(d, `instance-${i}`))));
    expect(digests.filter(Boolean)).toHaveLength(1);
    expect(await dbs[0].db.select().from(jobRuns)).toHaveLength(2);
    const tasks = await dbs[0].db.select().from(serviceTasks);
    expect(new Set(tasks.map((t) => `${t.bikeId}:${t.serviceItemId}`)).size).toBe(tasks.length);
    expect((await dbs[0].db.select().from(caughtMail)).filter((m) => m.to === w.people.manager.email)).toHaveLength(1);
  });
});
