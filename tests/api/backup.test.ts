import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { gunzipSync, gzipSync } from 'node:zlib';
import sharp from 'sharp';
import tar from 'tar-stream';
import { eq, sql } from 'drizzle-orm';
import type { Express } from 'express';
import { createApp } from '../../server/app';
import { testConfig } from '../../server/config';
import { openDatabase, type Database } from '../../server/db/client';
import { attachments, bikes, sessions } from '../../server/db/schema';
import { createBlobStore, createDiskBlobStore } from '../../server/storage';
import type { BlobStore } from '../../server/storage/types';
import { agent, manualClock, testDatabase, type Agent } from '../support/test-app';
import { PASSWORD, makeBike, makeServiceItem, makeSite, makeUser, world } from '../support/factories';

const clock = manualClock('2026-06-15T10:00:00Z');
interface World {
  app: Express;
  database: Database;
  store: BlobStore;
  /** Where the disk store keeps its files. */
  root: string;
}
let t: World;
let w: Awaited<ReturnType<typeof world>>;
const as: Record<string, Agent> = {};
const temps: string[] = [];
const tempDir = async () => {
  const d = await mkdtemp(join(tmpdir(), 'lashline-backup-test-'));
  temps.push(d);
  return d;
};
const build = (database: Database, blobStore: BlobStore) => createApp({ database, config: testConfig(), sessionSecret: 'test-secret-test-secret', now: clock.now, blobStore });

// Photos made with sharp; the smallest well-formed PDF (ISO 32000-1, section 7.5).
const jpeg = (background: string) => sharp({ create: { width: 640, height: 480, channels: 3, background } }).jpeg().toBuffer();
const pdf = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n' +
    '3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 595 842]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
);
const attach = (who: Agent, bikeId: string, bytes: Buffer, filename: string, contentType: string) =>
  who.post(`/api/bikes/${bikeId}/attachments`).attach('file', bytes, { filename, contentType });

beforeAll(async () => {
  const root = join(await tempDir(), 'uploads');
  const database = await testDatabase();
  const store = createDiskBlobStore(root);
  t = { app: build(database, store), database, store, root };
  w = await world(database.db);
  await makeServiceItem(database.db, w.model.id, { name: 'Engine oil' });
  for (const role of ['admin', 'manager'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
  as.signedOut = await agent(t.app);
  // Some history with every kind of column: readings (doubles, dates), audit entries (jsonb, a sequence).
  const check = await as.manager.post(`/api/bikes/${w.bikeA.id}/check-ins`).send({ odometer: 1234.5, date: '2026-06-01' });
  expect(check.status).toBe(201);
  await as.manager.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'out_of_service', reason: 'Chain "snatch", check sprockets' });
  // Two photos (each stored with its preview) and a document, on both sites' bikes.
  for (const [bike, bytes, name, type] of [
    [w.bikeA.id, await jpeg('#b5542d'), 'front-brake.jpg', 'image/jpeg'],
    [w.bikeB.id, await jpeg('#2c47b0'), 'chain.jpg', 'image/jpeg'],
    [w.bikeA.id, pdf, 'invoice.pdf', 'application/pdf'],
  ] as const)
    expect((await attach(as.manager, bike, bytes, name, type)).status).toBe(201);
});
afterAll(async () => {
  await t?.database.close();
  for (const d of temps) await rm(d, { recursive: true, force: true });
});

// Supertest hands the raw response stream to a custom parser; the body stays bytes.
const binary = (res: unknown, done: (err: Error | null, body: Buffer) => void) => {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
};
const download = (who: Agent, format?: string) => who.get(`/api/admin/backup${format ? `?format=${format}` : ''}`).buffer(true).parse(binary);
const upload = (who: Agent, file: Buffer) => who.post('/api/admin/restore').set('content-type', 'application/octet-stream').send(file);
const sha256 = (b: Buffer) => createHash('sha256').update(b).digest('hex');

/** The archive's entries by name, read with tar-stream and node:zlib (POSIX ustar in gzip, RFC 1952). */
async function unpack(file: Buffer) {
  const out = new Map<string, Buffer>();
  const extract = tar.extract();
  const reading = (async () => {
    for await (const entry of extract) {
      const chunks: Buffer[] = [];
      for await (const c of entry) chunks.push(c as Buffer);
      out.set(entry.header.name, Buffer.concat(chunks));
    }
  })();
  extract.end(gunzipSync(file));
  await reading;
  return out;
}
async function repack(entries: Map<string, Buffer>) {
  const pack = tar.pack();
  const chunks: Buffer[] = [];
  const collected = (async () => {
    for await (const c of pack) chunks.push(c as Buffer);
  })();
  for (const [name, bytes] of entries) await new Promise<void>((done, fail) => pack.entry({ name, size: bytes.length }, bytes, (e) => (e ? fail(e) : done())));
  pack.finalize();
  await collected;
  return gzipSync(Buffer.concat(chunks));
}
const manifestOf = (entries: Map<string, Buffer>) => JSON.parse(entries.get('lashline-backup/manifest.json')!.toString('utf8'));

/** Row count and an md5 over the rows in a fixed order, per table: sessions aside, and the backup and restore entries themselves aside. */
// The data version counter is not data: every write, a restore's included, moves it on.
async function fingerprint(database = t.database) {
  const { rows } = (await database.db.execute(sql`select tablename from pg_tables where schemaname = 'public' and tablename not in ('sessions', 'data_versions') order by 1`)) as unknown as { rows: { tablename: string }[] };
  const out: Record<string, { n: number; md5: string }> = {};
  for (const { tablename } of rows) {
    const where = tablename === 'audit_log' ? `where action not in ('backup', 'restore')` : '';
    const r = (await database.db.execute(
      sql.raw(`select count(*)::int as n, md5(coalesce(string_agg(x::text, '|' order by x::text), '')) as md5 from "${tablename}" x ${where}`),
    )) as unknown as { rows: { n: number; md5: string }[] };
    out[tablename] = { n: Number(r.rows[0].n), md5: r.rows[0].md5 };
  }
  return out;
}

/** Every file the attachment rows name, with the SHA-256 of what the store holds under it (null: nothing). */
async function storedFiles(database: Database, store: BlobStore) {
  const rows = await database.db.select({ key: attachments.storageKey, thumb: attachments.thumbKey }).from(attachments);
  const out: Record<string, string | null> = {};
  for (const key of rows.flatMap((r) => [r.key, r.thumb]).filter((k): k is string => !!k)) {
    const bytes = await store.get(key);
    out[key] = bytes ? sha256(bytes) : null;
  }
  return out;
}

/** Everything in a disk store's directory, by file name, with its SHA-256. */
async function storeDirectory(root: string) {
  const out: Record<string, string> = {};
  const names = await readdir(root, { recursive: true, withFileTypes: true }).catch(() => []);
  for (const d of names) if (d.isFile()) out[d.name] = sha256(await readFile(join(d.parentPath, d.name)));
  return out;
}

/** Changes that a restore must undo: rows, and files removed and added through the API. */
async function scribble() {
  const db = t.database.db;
  const [pdfRow] = await db.select().from(attachments).where(eq(attachments.mime, 'application/pdf'));
  expect((await as.manager.delete(`/api/attachments/${pdfRow.id}`)).status).toBe(204);
  expect((await attach(as.manager, w.bikeA.id, await jpeg('#3d7a3a'), 'after.jpg', 'image/jpeg')).status).toBe(201);
  await db.delete(bikes).where(eq(bikes.id, w.bikeB.id));
  await makeSite(db, 'Harbour Wall');
  await makeBike(db, w.model.id, w.siteA.id, { fleetNumber: 'SM-99' });
  await as.manager.post(`/api/bikes/${w.bikeA.id}/check-ins`).send({ odometer: 1300, date: '2026-06-10' });
}

async function signInAgain() {
  for (const role of ['admin', 'manager'] as const) {
    as[role] = await agent(t.app);
    expect((await as[role].login(w.people[role].email, PASSWORD)).status).toBe(200);
  }
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
    const before = { rows: await fingerprint(), files: await storeDirectory(t.root) };
    for (const file of [Buffer.from('fleet_number,date\r\n'), Buffer.from('{"format":"other"}'), Buffer.from([0x1f, 0x8b, 1, 2, 3, 4])]) {
      const res = await upload(as.admin, file);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
    const json = await as.admin.post('/api/admin/restore').send({ format: 'lashline-backup' });
    expect(json.status).toBe(400);
    expect(json.body.error.message).toContain('application/octet-stream');
    expect({ rows: await fingerprint(), files: await storeDirectory(t.root) }).toEqual(before);
  });
});

describe('the backup archive', () => {
  it('holds a manifest, the database and every stored file, each matching its SHA-256', async () => {
    const res = await download(as.admin);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/gzip');
    expect(res.headers['content-disposition']).toMatch(/filename="lashline-backup-\d{8}-\d{4}(-json)?\.tar\.gz"/);
    const file = res.body as Buffer;
    expect([file[0], file[1]]).toEqual([0x1f, 0x8b]); // gzip magic number, RFC 1952
    const entries = await unpack(file);
    const manifest = manifestOf(entries);
    const format = t.database.kind === 'pglite' ? 'data-dir' : 'json';
    expect(manifest).toMatchObject({ format: 'lashline-archive', version: 1, driver: t.database.kind, database: { format }, missing: [] });
    expect(manifest.schemaVersion.migrations).toBeGreaterThan(0);
    const db = entries.get(`lashline-backup/database/${format === 'data-dir' ? 'data-dir.tar.gz' : 'dump.json'}`)!;
    expect(manifest.database).toMatchObject({ size: db.length, sha256: sha256(db) });
    // Two photos with a preview each, and a PDF: five files, as the store holds them.
    const stored = await storedFiles(t.database, t.store);
    expect(Object.keys(stored)).toHaveLength(5);
    expect(Object.fromEntries(manifest.files.map((f: { key: string; sha256: string }) => [f.key, f.sha256]))).toEqual(stored);
    for (const f of manifest.files) {
      const bytes = entries.get(`lashline-backup/files/${f.key}`)!;
      expect([bytes.length, sha256(bytes)]).toEqual([f.size, f.sha256]);
    }
    expect(manifest.files.map((f: { contentType: string }) => f.contentType).sort()).toEqual(['application/pdf', 'image/jpeg', 'image/jpeg', 'image/webp', 'image/webp']);
  });
});

describe('a backup that cannot be finished', () => {
  it('is cut short when a stored file cannot be read, and the server goes on serving', async () => {
    const [pdfRow] = await t.database.db.select().from(attachments).where(eq(attachments.mime, 'application/pdf'));
    const failing: BlobStore = {
      ...t.store,
      get: async (key) => {
        if (key === pdfRow.storageKey) throw new Error('The bucket did not answer.');
        return t.store.get(key);
      },
    };
    const app = build(t.database, failing);
    const admin = await agent(app);
    expect((await admin.login(w.people.admin.email, PASSWORD)).status).toBe(200);
    // The answer had begun (200, gzip) when the file failed: the connection is closed before the end,
    // so the client sees an aborted download rather than a complete-looking file.
    const cut = await admin.get('/api/admin/backup').buffer(true).parse(binary).then(
      (res) => ({ status: res.status, complete: true }),
      (e: Error) => ({ status: 0, complete: false, message: e.message }),
    );
    expect(cut.complete).toBe(false);
    expect((await admin.get('/api/auth/me')).status).toBe(200);
    const whole = await download(as.admin);
    expect(whole.status).toBe(200);
    expect(manifestOf(await unpack(whole.body as Buffer)).files).toHaveLength(5);
  });
});

describe('backup then restore', () => {
  it('puts back the rows and the files, and removes the files only replaced rows named', async () => {
    const before = { rows: await fingerprint(), files: await storedFiles(t.database, t.store) };
    const file = (await download(as.admin)).body as Buffer;
    await scribble();
    const added = Object.keys(await storedFiles(t.database, t.store)).filter((k) => !(k in before.files));
    expect(added).toHaveLength(2);
    expect(await fingerprint()).not.toEqual(before.rows);

    const restored = await upload(as.admin, file);
    expect(restored.status).toBe(200);
    expect(restored.body.signedOut).toBe(true);
    const counts = Object.fromEntries(restored.body.tables.map((x: { name: string; rows: number }) => [x.name, x.rows]));
    expect(counts).toMatchObject({ bikes: before.rows.bikes.n, odometer_readings: before.rows.odometer_readings.n, users: before.rows.users.n, attachments: 3 });
    const manifest = manifestOf(await unpack(file));
    const bytes = manifest.files.reduce((n: number, f: { size: number }) => n + f.size, 0);
    // The PDF was removed through the API and the bike with the second photo deleted: the PDF came back
    // from the backup, the rest was still stored with the same bytes.
    expect(restored.body.files).toEqual({ included: true, named: 5, restored: 5, bytes, alreadyStored: 4, missing: 0, removed: 2 });
    expect(await fingerprint()).toEqual(before.rows);
    expect(await storedFiles(t.database, t.store)).toEqual(before.files);
    for (const key of added) expect(await t.store.get(key)).toBeNull();
    expect(Object.keys(await storeDirectory(t.root)).sort()).toEqual(Object.keys(before.files).sort());
    // Sessions are not restored: everyone, the administrator included, signs in again.
    expect(await t.database.db.select().from(sessions)).toHaveLength(0);
    expect((await as.admin.get('/api/auth/me')).status).toBe(401);
    await signInAgain();
  });

  it('restores the portable JSON dump inside the archive, and keeps sequences ahead of the restored rows', async () => {
    const before = await fingerprint();
    const res = await download(as.admin, 'json');
    expect(res.status).toBe(200);
    const entries = await unpack(res.body as Buffer);
    expect(manifestOf(entries).database.format).toBe('json');
    const dump = JSON.parse(entries.get('lashline-backup/database/dump.json')!.toString('utf8'));
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
    expect(restored.body.files).toMatchObject({ included: true, restored: 5 });
    expect(await fingerprint()).toEqual(before);
    await signInAgain();
    // A new audit entry after the restore takes the next id, not one already restored.
    const check = await as.admin.post(`/api/bikes/${w.bikeA.id}/status`).send({ status: 'in_service' });
    expect(check.status).toBe(200);
  });
});

describe('a backup that does not fit is refused, and nothing changes', () => {
  const unchanged = async () => ({ rows: await fingerprint(), files: await storeDirectory(t.root) });

  it('a stored file whose bytes no longer match its SHA-256', async () => {
    const entries = await unpack((await download(as.admin)).body as Buffer);
    const [victim] = manifestOf(entries).files;
    const name = `lashline-backup/files/${victim.key}`;
    const original = entries.get(name)!;
    const bytes = Buffer.from(original);
    bytes[bytes.length >> 1] ^= 0xff;
    entries.set(name, bytes);
    // The file is gone from the store too, so a restore that wrote it would show.
    await t.store.delete(victim.key);
    const before = await unchanged();
    const refused = await upload(as.admin, await repack(entries));
    expect(refused.status).toBe(400);
    expect(refused.body.error.code).toBe('validation_failed');
    expect(refused.body.error.message).toContain('damaged');
    expect(refused.body.error.details).toEqual([{ path: `files.${victim.key}`, message: 'Its bytes do not match the SHA-256 checksum in the manifest.' }]);
    expect(await unchanged()).toEqual(before);
    // The same archive with the file's own bytes restores, and the file is back.
    entries.set(name, original);
    expect((await upload(as.admin, await repack(entries))).status).toBe(200);
    expect(sha256((await t.store.get(victim.key))!)).toBe(victim.sha256);
    await signInAgain();
  });

  it('a file left out, an archive cut short, a manifest missing', async () => {
    const file = (await download(as.admin)).body as Buffer;
    const entries = await unpack(file);
    const before = await unchanged();
    const withoutOne = new Map(entries);
    withoutOne.delete(`lashline-backup/files/${manifestOf(entries).files[2].key}`);
    const noManifest = new Map(entries);
    noManifest.delete('lashline-backup/manifest.json');
    for (const broken of [await repack(withoutOne), file.subarray(0, file.length >> 1), await repack(noManifest)]) {
      const res = await upload(as.admin, broken);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
    expect(await unchanged()).toEqual(before);
  });

  it('a backup from a different schema version: 409, naming both versions', async () => {
    const entries = await unpack((await download(as.admin)).body as Buffer);
    const manifest = manifestOf(entries);
    manifest.schemaVersion.migrations += 1;
    entries.set('lashline-backup/manifest.json', Buffer.from(JSON.stringify(manifest)));
    const before = await unchanged();
    const refused = await upload(as.admin, await repack(entries));
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('conflict');
    expect(refused.body.error.details[0]).toMatchObject({ path: 'schemaVersion' });
    expect(refused.body.error.details[0].message).toContain(`${manifest.schemaVersion.migrations} migrations`);
    expect(await unchanged()).toEqual(before);
  });

  it('an older JSON dump whose tables do not match this version, naming them', async () => {
    const entries = await unpack((await download(as.admin, 'json')).body as Buffer);
    const dump = JSON.parse(entries.get('lashline-backup/database/dump.json')!.toString('utf8'));
    dump.tables = dump.tables.filter((x: { name: string }) => x.name !== 'defects');
    dump.tables.find((x: { name: string }) => x.name === 'bikes').columns.push({ name: 'colour', type: 'text' });
    const before = await unchanged();
    const refused = await upload(as.admin, Buffer.from(JSON.stringify(dump)));
    expect(refused.status).toBe(409);
    expect(refused.body.error.details.map((d: { path: string }) => d.path)).toEqual(expect.arrayContaining(['defects', 'bikes.colour']));
    expect(await unchanged()).toEqual(before);
  });
});

describe('older backups (the database alone)', () => {
  it('still restore, and the report says the files were not in them', async () => {
    const before = { rows: await fingerprint(), files: await storedFiles(t.database, t.store) };
    const entries = await unpack((await download(as.admin)).body as Buffer);
    // The dump inside the archive is exactly what a backup was before it held files.
    const old = entries.get(t.database.kind === 'pglite' ? 'lashline-backup/database/data-dir.tar.gz' : 'lashline-backup/database/dump.json')!;
    await scribble();
    const restored = await upload(as.admin, old);
    expect(restored.status).toBe(200);
    // The PDF removed through the API is named by the restored rows but was in no backup file.
    expect(restored.body.files).toEqual({ included: false, named: 5, restored: 0, bytes: 0, alreadyStored: 0, missing: 1, removed: 2 });
    expect(await fingerprint()).toEqual(before.rows);
    const pdfKey = manifestOf(entries).files.find((f: { contentType: string }) => f.contentType === 'application/pdf').key;
    expect(await storedFiles(t.database, t.store)).toEqual({ ...before.files, [pdfKey]: null });
    await signInAgain();
    // Put the PDF back for the next test: the archive restores it.
    expect((await upload(as.admin, await repack(entries))).status).toBe(200);
    await signInAgain();
  });
});

describe('restore on a new machine', () => {
  it('brings every row and every file into an empty data directory and a fresh store', async () => {
    const source = { rows: await fingerprint(), files: await storedFiles(t.database, t.store) };
    const file = (await download(as.admin)).body as Buffer;
    const manifest = manifestOf(await unpack(file));
    const entries = await unpack((await download(as.admin, 'json')).body as Buffer);

    const dir = await tempDir();
    // On PostgreSQL the test database is emptied instead (one server for the suite).
    const database = process.env.LASHLINE_TEST_DB === 'postgres' ? await testDatabase() : await openDatabase({ dataDir: dir });
    try {
      const store = createBlobStore({}, dir);
      const fresh: World = { app: build(database, store), database, store, root: join(dir, 'uploads') };
      const site = await makeSite(database.db, 'New Yard');
      const admin = await makeUser(database.db, 'admin', [site.id]);
      let who = await agent(fresh.app);
      expect((await who.login(admin.email, PASSWORD)).status).toBe(200);

      // First a restore whose rows the database refuses (a bike twice, checksums made to fit):
      // the files it wrote are taken out again.
      const dumpName = 'lashline-backup/database/dump.json';
      {
        const dump = JSON.parse(entries.get(dumpName)!.toString('utf8'));
        const b = dump.tables.find((x: { name: string }) => x.name === 'bikes');
        b.rows.push(b.rows[0]);
        const bytes = Buffer.from(JSON.stringify(dump));
        entries.set(dumpName, bytes);
        const m = manifestOf(entries);
        m.database = { ...m.database, size: bytes.length, sha256: sha256(bytes) };
        entries.set('lashline-backup/manifest.json', Buffer.from(JSON.stringify(m)));
        const before = await fingerprint(database);
        const refused = await upload(who, await repack(entries));
        expect(refused.status).toBe(400);
        expect(refused.body.error.details[0].path).toBe('bikes');
        expect(await fingerprint(database)).toEqual(before);
        expect(await storeDirectory(fresh.root)).toEqual({});
      }

      const restored = await upload(who, file);
      expect(restored.status).toBe(200);
      expect(restored.body.files).toMatchObject({ included: true, named: 5, restored: 5, alreadyStored: 0, missing: 0, removed: 0 });
      expect(await fingerprint(database)).toEqual(source.rows);
      // Every file, compared by SHA-256 (FIPS 180-4, node:crypto) with the original store's.
      expect(await storedFiles(database, store)).toEqual(source.files);
      expect(await storeDirectory(fresh.root)).toEqual(Object.fromEntries(manifest.files.map((f: { key: string; sha256: string }) => [f.key, f.sha256])));
      // The restored people sign in, and the photos open through the API as before.
      who = await agent(fresh.app);
      expect((await who.login(w.people.manager.email, PASSWORD)).status).toBe(200);
      const list = await who.get(`/api/bikes/${w.bikeA.id}/attachments`);
      expect(list.status).toBe(200);
      expect(list.body.items.map((a: { mime: string }) => a.mime).sort()).toEqual(['application/pdf', 'image/jpeg']);
      for (const a of list.body.items) {
        const [row] = await database.db.select().from(attachments).where(eq(attachments.id, a.id));
        const got = await who.get(a.url).buffer(true).parse(binary);
        expect(got.status).toBe(200);
        expect(sha256(got.body as Buffer)).toBe(source.files[row.storageKey]);
        if (row.thumbKey) {
          const thumb = await who.get(a.thumbUrl).buffer(true).parse(binary);
          expect(sha256(thumb.body as Buffer)).toBe(source.files[row.thumbKey]);
        }
      }
    } finally {
      await database.close();
    }
  });
});
