import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import sharp from 'sharp';
import exifr from 'exifr';
import { mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { count, eq } from 'drizzle-orm';
import type { Express } from 'express';
import { createApp } from '../../server/app';
import { testConfig } from '../../server/config';
import type { Database } from '../../server/db/client';
import { attachments, defects, serviceTasks } from '../../server/db/schema';
import { createBlobStore, createDiskBlobStore, createMemoryBlobStore } from '../../server/storage';
import { isLosslessWebp } from '../../server/services/attachment-files';
import { newBlobKey } from '../../server/storage/keys';
import type { BlobStore } from '../../server/storage/types';
import { agent, manualClock, testDatabase, type Agent } from '../support/test-app';
import { PASSWORD, makeServiceItem, world } from '../support/factories';
import { startFakeS3, type FakeS3 } from '../support/fake-s3';

const MB = 1024 * 1024;
const clock = manualClock('2026-04-06T08:30:00Z');
const store = createMemoryBlobStore();
let database: Database;
let app: Express;
let w: Awaited<ReturnType<typeof world>>;
let s3: FakeS3;
const as: Record<string, Agent> = {};

const build = (blobStore: BlobStore = store) =>
  createApp({
    database,
    // The clock moves a day in these tests: keep sessions alive across it.
    config: testConfig({ SESSION_ABSOLUTE_HOURS: 1000 }),
    sessionSecret: 'test-secret-test-secret',
    now: clock.now,
    blobStore,
  });

beforeAll(async () => {
  database = await testDatabase();
  app = build();
  w = await world(database.db);
  for (const role of ['admin', 'manager', 'technician', 'desk', 'technicianB'] as const) {
    as[role] = await agent(app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
  s3 = await startFakeS3();
});
afterAll(async () => {
  await s3?.close();
  await database?.close();
});

const jpeg = (width = 1200, height = 800) => sharp({ create: { width, height, channels: 3, background: '#b5542d' } }).jpeg().toBuffer();
const png = () => sharp({ create: { width: 200, height: 150, channels: 4, background: '#2c47b0' } }).png().toBuffer();
// The smallest well-formed PDF: header, one empty page, cross-reference table and trailer (ISO 32000-1, section 7.5).
const pdf = Buffer.from(
  '%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[3 0 R]/Count 1>>endobj\n' +
    '3 0 obj<</Type/Page/Parent 2 0 R/MediaBox[0 0 595 842]>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n',
);
const url = (bikeId = w.bikeA.id) => `/api/bikes/${bikeId}/attachments`;
const rows = async () => (await database.db.select({ n: count() }).from(attachments))[0].n;
const upload = (a: Agent, bytes: Buffer, name = 'front-brake.jpg', contentType = 'image/jpeg', bikeId = w.bikeA.id) =>
  a.post(url(bikeId)).attach('file', bytes, { filename: name, contentType });

describe('POST /api/bikes/:id/attachments', () => {
  it('refuses signed out (401), an administrator (403) and another site’s bike (404)', async () => {
    const anon = await agent(app);
    expect((await upload(anon, await jpeg())).status).toBe(401);
    const admin = await upload(as.admin, await jpeg());
    expect(admin.status).toBe(403);
    expect(admin.body.error.code).toBe('forbidden');
    const other = await upload(as.technician, await jpeg(), 'x.jpg', 'image/jpeg', w.bikeB.id);
    expect(other.status).toBe(404);
    expect(store.size).toBe(0);
  });

  it('takes a real JPEG from the desk: stored, with a 320 px WebP preview and the photo’s size', async () => {
    const bytes = await jpeg();
    const res = await upload(as.desk, bytes);
    expect(res.status).toBe(201);
    const a = res.body.attachment;
    expect(a).toMatchObject({ bikeId: w.bikeA.id, kind: 'photo', mime: 'image/jpeg', width: 1200, height: 800, name: 'front-brake.jpg' });
    expect(a.uploadedBy).toBe(w.people.desk.id);
    // The size recorded is that of the bytes served, which are the re-encoded photo.
    expect(a.bytes).toBe(((await as.desk.get(a.url)).body as Buffer).length);
    expect(a.thumbUrl).toBe(`/api/attachments/${a.id}/thumb`);
    const thumb = await as.desk.get(a.thumbUrl);
    expect(thumb.headers['content-type']).toBe('image/webp');
    const meta = await sharp(thumb.body as Buffer).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['webp', 320, 213]);
  });

  it('takes a PNG from a technician and a PDF as a document without a preview', async () => {
    const p = await upload(as.technician, await png(), 'chain.png', 'image/png');
    expect(p.status).toBe(201);
    expect(p.body.attachment).toMatchObject({ mime: 'image/png', width: 200, height: 150 });
    const d = await upload(as.manager, pdf, 'invoice.pdf', 'application/pdf');
    expect(d.status).toBe(201);
    expect(d.body.attachment).toMatchObject({ kind: 'document', mime: 'application/pdf', thumbUrl: null, width: null });
  });

  it('reports a turned photo upright: EXIF orientation 6 means rotate 90° (CIPA DC-008, Exif 2.32)', async () => {
    const turned = await sharp(await jpeg(400, 300)).withMetadata({ orientation: 6 }).jpeg().toBuffer();
    const res = await upload(as.desk, turned, 'tyre.jpg');
    expect(res.body.attachment).toMatchObject({ width: 300, height: 400 });
  });

  it('judges by content: text named .jpg and sent as image/jpeg is refused, and nothing is stored', async () => {
    const before = { blobs: store.size, rows: await rows() };
    const res = await upload(as.desk, Buffer.from('Front brake pads worn to 1 mm\n'), 'pads.jpg', 'image/jpeg');
    expect(res.status).toBe(400);
    expect(res.body.error).toMatchObject({ code: 'validation_failed', message: 'Upload a photo (JPEG, PNG, WebP) or a PDF.' });
    const svg = await upload(as.desk, Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>'), 'a.png', 'image/png');
    expect(svg.status).toBe(400);
    // A JPEG start followed by nonsense passes the magic-byte test but does not decode.
    const broken = await upload(as.desk, Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.alloc(2000, 7)]), 'b.jpg');
    expect(broken.status).toBe(400);
    expect({ blobs: store.size, rows: await rows() }).toEqual(before);
  });

  it('answers too large with 413 in the error shape, whether the size is declared or found while reading', async () => {
    const before = store.size;
    const justOver = Buffer.concat([await jpeg(64, 64), Buffer.alloc(8 * MB)]);
    const read = await upload(as.desk, justOver);
    expect(read.status).toBe(413);
    expect(read.body.error.code).toBe('payload_too_large');
    const declared = await upload(as.desk, Buffer.alloc(9 * MB));
    expect(declared.status).toBe(413);
    expect(declared.body.error.code).toBe('payload_too_large');
    expect(store.size).toBe(before);
  });

  it('refuses no file, a second file and a wrong field name with 400, never 500', async () => {
    const none = await as.desk.post(url()).field('defectId', '');
    expect(none.status).toBe(400);
    expect(none.body.error.details[0].path).toBe('file');
    expect((await as.desk.post(url()).send({ file: 'x' })).status).toBe(400);
    const two = await as.desk.post(url()).attach('file', await png(), 'a.png').attach('file', await png(), 'b.png');
    expect(two.status).toBe(400);
    expect((await as.desk.post(url()).attach('photo', await png(), 'a.png')).status).toBe(400);
    const cut = await as.desk.post(url()).set('content-type', 'multipart/form-data; boundary=xyz').send('--xyz\r\nContent-Disposition: form-data; name="file"; filename="a.jpg"\r\n\r\nabc');
    expect(cut.status).toBe(400);
  });

  it('links a defect or task of the same bike, and refuses one of another bike', async () => {
    const [d] = await database.db.insert(defects).values({ bikeId: w.bikeA.id, category: 'brakes', text: 'Rear disc scored' }).returning();
    const [dB] = await database.db.insert(defects).values({ bikeId: w.bikeB.id, category: 'tyres', text: 'Sidewall cut' }).returning();
    const item = await makeServiceItem(database.db, w.model.id);
    const [task] = await database.db.insert(serviceTasks).values({ bikeId: w.bikeA.id, serviceItemId: item.id, cycleKey: 'photo-test' }).returning();
    const ok = await as.technician.post(url()).field('defectId', d.id).field('taskId', task.id).attach('file', await png(), 'disc.png');
    expect(ok.status).toBe(201);
    expect(ok.body.attachment).toMatchObject({ defectId: d.id, taskId: task.id });
    const wrong = await as.technician.post(url()).field('defectId', dB.id).attach('file', await png(), 'disc.png');
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.details[0].path).toBe('defectId');
    expect((await as.technician.post(url()).field('taskId', 'nope').attach('file', await png(), 'x.png')).status).toBe(400);
    const listed = await as.desk.get(`${url()}?defectId=${d.id}`);
    expect(listed.body.items.map((x: { id: string }) => x.id)).toEqual([ok.body.attachment.id]);
  });
});

// What a phone puts in a photo: where it was taken (the GPS IFD), the camera and the time in EXIF,
// the place again in XMP, and an orientation tag telling viewers to turn the picture.
const GPS = { GPSLatitudeRef: 'N', GPSLatitude: '52/1 57/1 1234/100', GPSLongitudeRef: 'E', GPSLongitude: '1/1 17/1 0/1' };
const XMP =
  '<?xpacket begin="" id="W5M0MpCehiHzreSzNTczkc9d"?><x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">' +
  '<rdf:Description rdf:about="" xmlns:exif="http://ns.adobe.com/exif/1.0/" exif:GPSLatitude="52,57.2N" exif:GPSLongitude="1,17.0E"/></rdf:RDF></x:xmpmeta><?xpacket end="w"?>';
const RED = [0xc0, 0x30, 0x2a];
const BLUE = [0x2c, 0x47, 0xb0];
/** 60 × 40 as the sensor saw it: the left half red, the right half blue. */
async function phonePhoto(format: 'jpeg' | 'png' | 'webp', opts: { orientation?: number; lossless?: boolean } = {}) {
  const left = await sharp({ create: { width: 30, height: 40, channels: 3, background: '#c0302a' } }).png().toBuffer();
  return sharp({ create: { width: 60, height: 40, channels: 3, background: '#2c47b0' } })
    .composite([{ input: left, left: 0, top: 0 }])
    .withExif({ IFD0: { Make: 'Workshop test camera' }, IFD2: { DateTimeOriginal: '2026:04:06 08:30:00' }, IFD3: GPS })
    .withMetadata({ orientation: opts.orientation ?? 6 })
    .withXmp(XMP)
    .toFormat(format, opts.lossless ? { lossless: true } : {})
    .toBuffer();
}
const pixel = async (bytes: Buffer, x: number, y: number) => {
  const { data, info } = await sharp(bytes).raw().toBuffer({ resolveWithObject: true });
  const at = (y * info.width + x) * info.channels;
  return [data[at], data[at + 1], data[at + 2]];
};
const near = (got: number[], want: number[], by = 12) => got.every((v, i) => Math.abs(v - want[i]) <= by);
// The chunks of a WebP file, walked as RFC 9649 (WebP Image Format), section 2.7, lays them out.
function webpChunks(b: Buffer) {
  const names: string[] = [];
  for (let at = 12; at + 8 <= b.length; ) {
    const size = b.readUInt32LE(at + 4);
    names.push(b.toString('latin1', at, at + 4));
    at += 8 + size + (size % 2);
  }
  return names;
}
// exifr (an independent EXIF, XMP and IPTC reader) is the outside reference for what a file carries.
// IFD0 is always read with the TIFF block; the colour profile and the PNG header are not metadata about the scene.
const everything = { tiff: true, exif: true, gps: true, interop: true, ifd1: true, makerNote: true, userComment: true, xmp: true, iptc: true, icc: false, jfif: false, ihdr: false };
const download = async (a: { url: string }) => (await as.technician.get(a.url)).body as Buffer;

describe('photos are stored without the metadata a phone writes', () => {
  it('keeps a JPEG as JPEG, upright, with no location and no EXIF at all', async () => {
    const sent = await phonePhoto('jpeg');
    const place = await exifr.gps(sent);
    expect(place.latitude).toBeCloseTo(52 + 57 / 60 + 12.34 / 3600, 6);
    expect(place.longitude).toBeCloseTo(1 + 17 / 60, 6);
    // CIPA DC-008 (Exif 2.32), Orientation 6: shown turned 90° clockwise, so width and height swap.
    expect(await exifr.orientation(sent)).toBe(6);
    expect(await exifr.rotation(sent)).toMatchObject({ deg: 90, dimensionSwapped: true });

    const res = await upload(as.technician, sent, 'rear-tyre.jpg');
    expect(res.status).toBe(201);
    const a = res.body.attachment;
    expect(a).toMatchObject({ mime: 'image/jpeg', width: 40, height: 60, name: 'rear-tyre.jpg' });
    const stored = await download(a);
    expect(stored.length).toBe(a.bytes);
    expect(await exifr.gps(stored)).toBeUndefined();
    expect(await exifr.parse(stored, everything)).toBeUndefined();
    expect(await exifr.orientation(stored)).toBeUndefined();
    const meta = await sharp(stored).metadata();
    expect([meta.format, meta.width, meta.height]).toEqual(['jpeg', 40, 60]);
    // Turned clockwise, the sensor's left (red) half is now the top, its right (blue) half the bottom.
    expect(near(await pixel(stored, 20, 10), RED)).toBe(true);
    expect(near(await pixel(stored, 20, 50), BLUE)).toBe(true);
    // The WebP preview carries none either.
    expect(webpChunks(await download({ url: a.thumbUrl })).filter((c) => c === 'EXIF' || c === 'XMP ')).toEqual([]);
  });

  it('keeps a PNG as PNG, upright and pixel for pixel, without its eXIf chunk or XMP', async () => {
    const sent = await phonePhoto('png');
    expect(await exifr.gps(sent)).toMatchObject({ latitude: expect.any(Number) });
    expect(await exifr.orientation(sent)).toBe(6);
    const a = (await upload(as.technician, sent, 'chain.png', 'image/png')).body.attachment;
    expect(a).toMatchObject({ mime: 'image/png', width: 40, height: 60 });
    const stored = await download(a);
    expect(stored.length).toBe(a.bytes);
    expect(await exifr.parse(stored, everything)).toBeUndefined();
    expect((await sharp(stored).metadata()).format).toBe('png');
    // PNG is lossless (ISO/IEC 15948): the colours come back exactly.
    expect(await pixel(stored, 20, 10)).toEqual(RED);
    expect(await pixel(stored, 20, 50)).toEqual(BLUE);
  });

  it('keeps a WebP as WebP without EXIF or XMP chunks, and a lossless one lossless', async () => {
    for (const lossless of [false, true]) {
      const sent = await phonePhoto('webp', { lossless });
      expect(webpChunks(sent)).toEqual(expect.arrayContaining(['VP8X', 'EXIF', 'XMP ']));
      const a = (await upload(as.technician, sent, 'fork-seal.webp', 'image/webp')).body.attachment;
      expect(a).toMatchObject({ mime: 'image/webp', width: 40, height: 60 });
      const stored = await download(a);
      expect(stored.length).toBe(a.bytes);
      const chunks = webpChunks(stored);
      expect(chunks).not.toContain('EXIF');
      expect(chunks).not.toContain('XMP ');
      // RFC 9649: 'VP8L' holds the lossless coding, 'VP8 ' the lossy one.
      expect(chunks).toContain(lossless ? 'VP8L' : 'VP8 ');
      expect(isLosslessWebp(stored)).toBe(lossless);
      expect(near(await pixel(stored, 20, 10), RED, lossless ? 0 : 12)).toBe(true);
      expect(near(await pixel(stored, 20, 50), BLUE, lossless ? 0 : 12)).toBe(true);
    }
  });

  it('records what is stored: the listed size and dimensions are those of the served file', async () => {
    const a = (await upload(as.desk, await phonePhoto('jpeg', { orientation: 8 }), 'mirror.jpg')).body.attachment;
    const [row] = await database.db.select().from(attachments).where(eq(attachments.id, a.id));
    const stored = await download(a);
    const meta = await sharp(stored).metadata();
    expect({ bytes: row.bytes, width: row.width, height: row.height, mime: row.mime }).toEqual({ bytes: stored.length, width: meta.width, height: meta.height, mime: 'image/jpeg' });
    // Orientation 8 is a quarter turn the other way (CIPA DC-008): the red half ends at the bottom.
    expect([meta.width, meta.height]).toEqual([40, 60]);
    expect(near(await pixel(stored, 20, 50), RED)).toBe(true);
  });

  it('leaves a PDF byte for byte as sent', async () => {
    const a = (await upload(as.manager, pdf, 'service-sheet.pdf', 'application/pdf')).body.attachment;
    const stored = await download(a);
    expect(Buffer.compare(stored, pdf)).toBe(0);
    expect(a.bytes).toBe(pdf.length);
  });

  it('refuses a HEIC it cannot clean, and a moving image, saying what to send instead', async () => {
    const before = { blobs: store.size, rows: await rows() };
    // An ISO/IEC 23008-12 file type box with the 'heic' brand, then HEVC data the server cannot decode.
    const heic = Buffer.concat([Buffer.from([0, 0, 0, 0x18]), Buffer.from('ftypheic'), Buffer.alloc(4), Buffer.from('mif1heic'), Buffer.alloc(400, 3)]);
    const h = await upload(as.desk, heic, 'IMG_0042.HEIC', 'image/heic');
    expect(h.status).toBe(400);
    expect(h.body.error.code).toBe('validation_failed');
    expect(h.body.error.message).toMatch(/HEIC.*JPEG/);
    const frame = (c: string) => sharp({ create: { width: 40, height: 30, channels: 3, background: c } }).png().toBuffer();
    const moving = await sharp([await frame('#c0302a'), await frame('#2c47b0')], { join: { animated: true } }).webp().toBuffer();
    const m = await upload(as.desk, moving, 'brake-light.webp', 'image/webp');
    expect(m.status).toBe(400);
    expect(m.body.error.message).toMatch(/still photo/);
    expect({ blobs: store.size, rows: await rows() }).toEqual(before);
  });
});

describe('reading attachments', () => {
  it('lists a bike’s files for its site only, newest first', async () => {
    expect((await request(app).get(url())).status).toBe(401);
    const res = await as.desk.get(url());
    expect(res.status).toBe(200);
    expect(res.body.items.length).toBeGreaterThan(2);
    expect(res.body.items.every((a: { bikeId: string }) => a.bikeId === w.bikeA.id)).toBe(true);
    expect((await as.technicianB.get(url())).status).toBe(404);
  });

  it('serves the file inline with a safe name, nosniff and a private cache, to the bike’s site only', async () => {
    const bytes = await jpeg(80, 60);
    const a = (await upload(as.desk, bytes, '../../Ölwechsel "neu".html', 'text/html')).body.attachment;
    const res = await as.technician.get(a.url);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('image/jpeg');
    expect((res.body as Buffer).length).toBe(a.bytes);
    const served = await sharp(res.body as Buffer).metadata();
    expect([served.format, served.width, served.height]).toEqual(['jpeg', 80, 60]);
    // RFC 6266: a quoted ASCII filename, and the UTF-8 one in RFC 8187 form beside it.
    expect(res.headers['content-disposition']).toBe(`inline; filename="Olwechsel _neu_.jpg"; filename*=UTF-8''%C3%96lwechsel%20_neu_.jpg`);
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['cache-control']).toMatch(/^private/);
    expect((await as.technicianB.get(a.url)).status).toBe(404);
    expect((await request(app).get(a.url)).status).toBe(401);
    expect((await as.desk.get(`/api/attachments/${newBlobKey()}`)).status).toBe(404);
  });
});

describe('DELETE /api/attachments/:id', () => {
  it('lets the uploader remove their own within 24 hours, a manager any time, and nobody else', async () => {
    const mine = (await upload(as.desk, await png(), 'a.png', 'image/png')).body.attachment;
    const later = (await upload(as.desk, await png(), 'b.png', 'image/png')).body.attachment;
    const blobs = store.size;
    expect((await as.technician.delete(mine.url)).status).toBe(403);
    expect((await as.technicianB.delete(mine.url)).status).toBe(404);
    expect((await as.desk.delete(mine.url)).status).toBe(204);
    expect(store.size).toBe(blobs - 2);
    expect((await as.desk.get(mine.url)).status).toBe(404);
    clock.advance(24 * 3_600_000 + 1);
    const late = await as.desk.delete(later.url);
    expect(late.status).toBe(403);
    expect(late.body.error.message).toMatch(/manager/);
    expect((await as.manager.delete(later.url)).status).toBe(204);
    const [gone] = await database.db.select().from(attachments).where(eq(attachments.id, later.id));
    expect(gone).toBeUndefined();
  });
});

describe('blob stores', () => {
  it('round-trips through the S3 store against an S3-compatible server, with the real SDK', async () => {
    const env = { S3_BUCKET: s3.bucket, S3_ENDPOINT: s3.endpoint, S3_REGION: s3.region, S3_ACCESS_KEY_ID: s3.accessKeyId, S3_SECRET_ACCESS_KEY: s3.secretAccessKey };
    const bucket = createBlobStore(env, '/nowhere');
    expect(bucket.describe).toMatch(/^S3 bucket/);
    const key = newBlobKey();
    const bytes = await jpeg(32, 32);
    await bucket.put(key, bytes, 'image/jpeg');
    expect(s3.objects.get(key)?.contentType).toBe('image/jpeg');
    expect(Buffer.compare((await bucket.get(key))!, bytes)).toBe(0);
    expect(await bucket.get(newBlobKey())).toBeNull();
    await bucket.delete(key);
    expect(await bucket.get(key)).toBeNull();
    // The fake checks signatures, so a wrong secret is refused as S3 would refuse it.
    const wrong = createBlobStore({ ...env, S3_SECRET_ACCESS_KEY: 'not-the-secret' }, '/nowhere');
    await expect(wrong.put(newBlobKey(), bytes, 'image/jpeg')).rejects.toThrow();
    expect(() => createBlobStore({ S3_BUCKET: 'b', S3_ACCESS_KEY_ID: 'only-half' }, '/nowhere')).toThrow(/S3_SECRET_ACCESS_KEY/);

    const s3App = build(bucket);
    const desk = await agent(s3App);
    await desk.login(w.people.desk.email, PASSWORD);
    const a = (await upload(desk, bytes)).body.attachment;
    expect(s3.objects.size).toBe(2);
    expect(((await desk.get(a.url)).body as Buffer).length).toBe(a.bytes);
    expect((await desk.delete(a.url)).status).toBe(204);
    expect(s3.objects.size).toBe(0);
  });

  it('leaves nothing behind when the store fails halfway through an upload', async () => {
    const inner = createMemoryBlobStore();
    let puts = 0;
    const flaky: BlobStore = { ...inner, put: async (k, b, t) => (++puts === 2 ? Promise.reject(new Error('disk full')) : inner.put(k, b, t)), get: inner.get, delete: inner.delete };
    const desk = await agent(build(flaky));
    await desk.login(w.people.desk.email, PASSWORD);
    const before = await rows();
    const res = await upload(desk, await jpeg(64, 64));
    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe('internal');
    expect(inner.size).toBe(0);
    expect(await rows()).toBe(before);
  });

  it('round-trips through the disk store under DATA_DIR/uploads, private to the server’s user', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'lashline-uploads-'));
    try {
      const disk = createBlobStore({}, dir);
      expect(disk.describe).toBe(`files in ${join(dir, 'uploads')}`);
      const key = newBlobKey();
      await disk.put(key, pdf, 'application/pdf');
      const file = join(dir, 'uploads', key.slice(0, 2), key);
      expect((await stat(file)).mode & 0o777).toBe(0o600);
      expect(Buffer.compare((await disk.get(key))!, pdf)).toBe(0);
      await disk.delete(key);
      expect(await disk.get(key)).toBeNull();
      await disk.delete(key);
      const raw = createDiskBlobStore(join(dir, 'uploads'));
      await expect(raw.get('../../etc/passwd')).rejects.toThrow(/Not a blob key/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
