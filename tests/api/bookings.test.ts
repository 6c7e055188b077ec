import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { count, eq } from 'drizzle-orm';
import { TZDate } from '@date-fns/tz';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeBike, makeModel, world } from '../support/factories';
import { bookingFeeds, bookings } from '../../server/db/schema';
import { syncAllFeeds } from '../../server/services/booking-feeds';
import { run as bookingSync } from '../../jobs/booking-sync';
import { fetchCalendar } from '../../server/services/booking-feed-fetch';

const clock = manualClock('2026-12-03T10:15:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let breeze: Awaited<ReturnType<typeof makeModel>>;
let sm07: Awaited<ReturnType<typeof makeBike>>;
const as: Record<string, Agent> = {};
const LONDON = 'Europe/London';

// A calendar server on 127.0.0.1: each path answers what the test puts in `pages`.
const pages = new Map<string, { status: number; body: string }>();
let server: Server;
let base = '';

beforeAll(async () => {
  t = await testApp({ now: clock.now });
  const db = t.database.db;
  w = await world(db);
  breeze = await makeModel(db, { name: 'Breeze 125' });
  sm07 = await makeBike(db, w.model.id, w.siteA.id, { fleetNumber: 'SM-07' });
  for (let i = 0; i < 3; i++) await makeBike(db, breeze.id, w.siteA.id);
  await makeBike(db, breeze.id, w.siteA.id, { status: 'retired' });
  for (const role of ['desk', 'manager', 'technician', 'admin'] as const) {
    as[role] = await agent(t.app);
    await as[role].login(w.people[role].email, PASSWORD);
  }
  as.technicianB = await agent(t.app);
  await as.technicianB.login(w.people.technicianB.email, PASSWORD);
  as.signedOut = await agent(t.app);
  server = createServer((req, res) => {
    if (req.url === '/slow.ics') return void setTimeout(() => res.end('late'), 2000);
    const p = pages.get(req.url ?? '') ?? { status: 404, body: 'no such calendar' };
    res.writeHead(p.status, { 'content-type': 'text/calendar' }).end(p.body);
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterAll(async () => {
  await new Promise((r) => server.close(r));
  await t.close();
});

const localIso = (y: number, m: number, d: number, h: number) => new Date(new TZDate(y, m - 1, d, h, 0, 0, LONDON).getTime()).toISOString();
const bookingRows = async () => (await t.database.db.select({ n: count() }).from(bookings))[0].n;

describe('one booking at a time', () => {
  it('refuses signed out (401) and a technician (403)', async () => {
    const body = { siteId: w.siteA.id, kind: 'hire', bikeId: sm07.id, start: localIso(2026, 12, 12, 9), end: localIso(2026, 12, 12, 17) };
    expect((await as.signedOut.post('/api/bookings').send(body)).status).toBe(401);
    expect((await as.technician.post('/api/bookings').send(body)).status).toBe(403);
    expect((await as.signedOut.get('/api/bookings')).status).toBe(401);
  });

  it('creates a hire for one bike and lists it with its fleet number, model and occurrence', async () => {
    const res = await as.desk.post('/api/bookings').send({ siteId: w.siteA.id, kind: 'hire', bikeId: sm07.id, start: localIso(2026, 12, 12, 9), end: localIso(2026, 12, 13, 17), title: 'Weekend hire' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ fleetNumber: 'SM-07', modelName: w.model.name, source: 'manual', title: 'Weekend hire', quantity: 1 });
    const list = await as.desk.get(`/api/bookings?site=${w.siteA.id}&from=2026-12-01&to=2026-12-31`);
    expect(list.status).toBe(200);
    const item = list.body.items.find((b: { id: string }) => b.id === res.body.id);
    expect(item.occurrences).toEqual([{ start: localIso(2026, 12, 12, 9), end: localIso(2026, 12, 13, 17) }]);
  });

  it('creates a weekly lesson block for a model and expands it at 09:00 local (checked with @date-fns/tz)', async () => {
    const res = await as.manager.post('/api/bookings').send({
      siteId: w.siteA.id, kind: 'lesson', modelId: breeze.id, quantity: 3, start: localIso(2026, 12, 5, 9), end: localIso(2026, 12, 5, 12), title: 'Saturday lessons', rrule: 'FREQ=WEEKLY;BYDAY=SA;COUNT=4',
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    // rrule's toText form of the rule.
    expect(res.body.ruleText).toBe('every week on Saturday for 4 times');
    const list = await as.manager.get(`/api/bookings?site=${w.siteA.id}&from=2026-12-10&to=2027-01-31`);
    const item = list.body.items.find((b: { id: string }) => b.id === res.body.id);
    // 5 Dec is before the range: 12, 19 and 26 Dec remain (RFC 5545 COUNT counts from DTSTART).
    expect(item.occurrences.map((o: { start: string }) => o.start)).toEqual([12, 19, 26].map((d) => localIso(2026, 12, d, 9)));
  });

  it('refuses in words: end before start, neither or both of bike and model, another site’s bike, too many bikes, a bad rule, more than 60 days', async () => {
    const ok = { siteId: w.siteA.id, kind: 'hire', start: localIso(2026, 12, 12, 9), end: localIso(2026, 12, 12, 17) };
    const cases: [object, RegExp][] = [
      [{ ...ok, bikeId: sm07.id, end: localIso(2026, 12, 12, 8) }, /end is not after the start/],
      [{ ...ok }, /Name the bike/],
      [{ ...ok, bikeId: sm07.id, modelId: breeze.id }, /not both/],
      [{ ...ok, bikeId: w.bikeB.id }, /works from .*not/],
      [{ ...ok, modelId: breeze.id, quantity: 4 }, /has 3 Breeze 125 bikes; 4 cannot be booked/],
      [{ ...ok, bikeId: sm07.id, rrule: 'FREQ=SOMETIMES' }, /repeat rule/],
      [{ ...ok, bikeId: sm07.id, end: localIso(2027, 2, 12, 9) }, /at most 60 days/],
      [{ ...ok, bikeId: sm07.id, start: '2026-12-12 09:00' }, /ISO 8601 with its offset/],
    ];
    const before = await bookingRows();
    for (const [body, message] of cases) {
      const res = await as.manager.post('/api/bookings').send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      expect(res.body.error.message, JSON.stringify(body)).toMatch(message);
    }
    expect(await bookingRows()).toBe(before);
  });

  it('keeps a site’s bookings to its own people: another site’s booking answers 404', async () => {
    const mine = await as.manager.post('/api/bookings').send({ siteId: w.siteB.id, kind: 'hire', bikeId: w.bikeB.id, start: localIso(2026, 12, 20, 9), end: localIso(2026, 12, 20, 17) });
    expect(mine.status).toBe(201);
    expect((await as.desk.delete(`/api/bookings/${mine.body.id}`)).status).toBe(404);
    expect((await as.desk.get(`/api/bookings?site=${w.siteB.id}`)).status).toBe(404);
    expect((await as.desk.post('/api/bookings').send({ siteId: w.siteB.id, kind: 'hire', bikeId: w.bikeB.id, start: localIso(2026, 12, 21, 9), end: localIso(2026, 12, 21, 17) })).status).toBe(404);
    const deskList = await as.desk.get('/api/bookings?from=2026-12-01&to=2026-12-31');
    expect(deskList.body.items.every((b: { siteId: string }) => b.siteId === w.siteA.id)).toBe(true);
    const del = await as.manager.delete(`/api/bookings/${mine.body.id}`);
    expect(del.status).toBe(200);
    expect(await t.database.db.select().from(bookings).where(eq(bookings.id, mine.body.id))).toEqual([]);
    expect((await as.manager.delete(`/api/bookings/${mine.body.id}`)).status).toBe(404);
  });
});

describe('a CSV file of bookings (RFC 4180)', () => {
  const header = 'site,kind,fleet_number,model,quantity,start,end,title,repeat';
  const csv = (...lines: string[]) => [header, ...lines].join('\r\n') + '\r\n';

  it('previews row by row, and refuses the whole file when a row is wrong, writing nothing', async () => {
    const name = w.siteA.name;
    const file = csv(
      `${name},hire,SM-07,,,2026-12-19 09:00,2026-12-19 17:00,"Hire, full day",`,
      `${name},lesson,,Breeze 125,9,2026-12-19 09:00,2026-12-19 12:00,Lesson,`,
      `${name},party,,Breeze 125,2,2026-12-19 09:00,2026-12-19 08:00,Lesson,FREQ=WEEKLY;BYDAY=XX`,
      `Nowhere,hire,SM-07,,,2026-12-19 09:00,2026-12-19 17:00,,`,
    );
    const preview = await as.desk.post('/api/bookings/import/preview').set('content-type', 'text/csv').send(file);
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ valid: 1, invalid: 3 });
    const fields = Object.fromEntries(preview.body.rows.map((r: { line: number; errors: { field: string }[] }) => [r.line, r.errors.map((e) => e.field).sort()]));
    expect(fields).toEqual({ 2: [], 3: ['quantity'], 4: ['kind', 'repeat'], 5: ['site'] });
    const before = await bookingRows();
    const commit = await as.desk.post('/api/bookings/import').set('content-type', 'text/csv').send(file);
    expect(commit.status).toBe(400);
    expect(commit.body.error.message).toMatch(/3 rows have errors, so nothing was imported/);
    expect(commit.body.error.details.map((d: { path: string }) => d.path)).toContain('line 3.quantity');
    expect(await bookingRows()).toBe(before);
  });

  it('stores every row of a good file in one go, local times read in the site’s zone', async () => {
    const name = w.siteA.name;
    const file = csv(
      `${name},hire,SM-07,,,2026-12-26 09:00,2026-12-26 17:00,Boxing Day hire,`,
      `${name},lesson,,breeze 125,2,2027-01-09T09:00:00Z,2027-01-09T12:00:00Z,Winter lessons,FREQ=WEEKLY;COUNT=3`,
    );
    const before = await bookingRows();
    const res = await as.desk.post('/api/bookings/import').set('content-type', 'text/csv').send(file);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.imported).toBe(2);
    expect(await bookingRows()).toBe(before + 2);
    const [hire] = await t.database.db.select().from(bookings).where(eq(bookings.id, res.body.ids[0]));
    // 09:00 in London in December is 09:00 UTC (GMT, UK Summer Time Order); checked with @date-fns/tz.
    expect(hire.startAt.toISOString()).toBe(localIso(2026, 12, 26, 9));
    expect(hire.source).toBe('csv');
  });

  it('refuses a file without the columns it needs', async () => {
    const res = await as.desk.post('/api/bookings/import/preview').set('content-type', 'text/csv').send('site,kind\r\nA,hire\r\n');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/lacks the columns start, end, fleet_number or model/);
  });
});

const ics = (...events: string[]) => ['BEGIN:VCALENDAR', 'VERSION:2.0', 'PRODID:-//Saltmarsh test//EN', ...events, 'END:VCALENDAR', ''].join('\r\n');
const vevent = (uid: string, start: string, end: string, summary: string, ...more: string[]) =>
  ['BEGIN:VEVENT', `UID:${uid}`, 'DTSTAMP:20261201T000000Z', `DTSTART;TZID=Europe/London:${start}`, `DTEND;TZID=Europe/London:${end}`, `SUMMARY:${summary}`, ...more, 'END:VEVENT'].join('\r\n');

describe('calendar feeds (iCalendar, RFC 5545)', () => {
  it('refuses a desk (403), a non-web address (400), and loads a good feed at once', async () => {
    expect((await as.desk.get('/api/booking-feeds')).status).toBe(403);
    const bad = await as.manager.post('/api/booking-feeds').send({ siteId: w.siteA.id, name: 'Hires', url: 'file:///etc/passwd', kind: 'hire' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/https:\/\//);

    pages.set('/hires.ics', {
      status: 200,
      body: ics(
        vevent('h1@test', '20261205T090000', '20261205T170000', 'Hire SM-07'),
        vevent('h2@test', '20261206T090000', '20261206T170000', 'Group ride ×2', 'DESCRIPTION:Breeze 125 for two riders'),
        vevent('h3@test', '20261207T090000', '20261207T170000', 'Weekly hire', 'RRULE:FREQ=WEEKLY;COUNT=4', 'X-LASHLINE-BIKE:SM-07', 'EXDATE;TZID=Europe/London:20261214T090000'),
        vevent('h4@test', '20261208T090000', '20261208T170000', 'Somebody, no bike named'),
        vevent('h5@test', '20261209T090000', '20261209T170000', 'Cancelled hire SM-07', 'STATUS:CANCELLED'),
      ),
    });
    const res = await as.manager.post('/api/booking-feeds').send({ siteId: w.siteA.id, name: 'Online hires', url: `${base}/hires.ics`, kind: 'hire' });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    // h1, h2, and h3 on 7, 21 and 28 Dec (14 Dec is an EXDATE): 5 events; h4 names nothing.
    expect(res.body.result).toMatchObject({ ok: true, events: 5, skipped: 1, error: null });
    expect(res.body.result.message).toBe('Loaded at 10:15: 5 events. 1 event skipped: no bike or model named.');
    const rows = await t.database.db.select().from(bookings).where(eq(bookings.feedId, res.body.feed.id));
    expect(rows).toHaveLength(5);
    const group = rows.find((r) => r.title.startsWith('Group'))!;
    expect(group).toMatchObject({ modelId: breeze.id, quantity: 2, bikeId: null, source: 'feed' });
    expect(rows.filter((r) => r.bikeId === sm07.id).map((r) => r.startAt.toISOString()).sort()).toEqual([5, 7, 21, 28].map((d) => localIso(2026, 12, d, 9)));

    const refused = await as.desk.delete(`/api/bookings/${group.id}`);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toBe("This booking comes from the feed 'Online hires'; change it in that calendar.");
  });

  it('keeps the last good copy when the feed fails, and says so', async () => {
    const [feed] = await t.database.db.select().from(bookingFeeds).where(eq(bookingFeeds.name, 'Online hires'));
    pages.set('/hires.ics', { status: 500, body: 'broken' });
    clock.advance(30 * 60_000);
    const [result] = await syncAllFeeds(t.database.db, clock.now());
    expect(result).toMatchObject({ ok: false, error: '500 Internal Server Error' });
    expect(await t.database.db.select({ n: count() }).from(bookings).where(eq(bookings.feedId, feed.id))).toEqual([{ n: 5 }]);
    const list = await as.manager.get('/api/booking-feeds');
    const shown = list.body.items.find((f: { id: string }) => f.id === feed.id);
    expect(shown.status).toBe('Could not load at 10:45: 500 Internal Server Error. Showing the copy from 10:15, 5 events.');

    pages.set('/hires.ics', { status: 200, body: 'this is not a calendar' });
    const job = await bookingSync({ db: t.database.db, now: clock.now, mail: { transport: () => { throw new Error('no mail'); }, from: 'x' }, publicUrl: 'http://x', log: () => undefined });
    expect(job.failed).toBe(1);
    expect(await t.database.db.select({ n: count() }).from(bookings).where(eq(bookings.feedId, feed.id))).toEqual([{ n: 5 }]);
  });

  it('replaces the copy on the next good load, and removes its bookings with the feed', async () => {
    const [feed] = await t.database.db.select().from(bookingFeeds).where(eq(bookingFeeds.name, 'Online hires'));
    pages.set('/hires.ics', { status: 200, body: ics(vevent('h9@test', '20261219T090000', '20261219T170000', 'Hire SM-07')) });
    const [result] = await syncAllFeeds(t.database.db, clock.now());
    expect(result).toMatchObject({ ok: true, events: 1, skipped: 0 });
    expect(await t.database.db.select({ n: count() }).from(bookings).where(eq(bookings.feedId, feed.id))).toEqual([{ n: 1 }]);
    expect((await as.technicianB.delete(`/api/booking-feeds/${feed.id}`)).status).toBe(403);
    expect((await as.manager.delete(`/api/booking-feeds/${feed.id}`)).status).toBe(200);
    expect(await t.database.db.select({ n: count() }).from(bookings).where(eq(bookings.feedId, feed.id))).toEqual([{ n: 0 }]);
  });

  it('says when a feed cannot be reached at all', async () => {
    const res = await as.manager.post('/api/booking-feeds').send({ siteId: w.siteA.id, name: 'Missing', url: `${base}/missing.ics`, kind: 'lesson', defaultModelId: breeze.id });
    expect(res.status).toBe(201);
    expect(res.body.result).toMatchObject({ ok: false, error: '404 Not Found' });
    expect(res.body.feed.status).toBe('Could not load at 10:45: 404 Not Found. No copy has loaded yet, so it adds no bookings.');
  });

  it('gives up on a feed that does not answer in time or is too large', async () => {
    await expect(fetchCalendar(`${base}/slow.ics`, { timeoutMs: 200 })).rejects.toThrow('No answer within 0.2 s');
    pages.set('/big.ics', { status: 200, body: 'X'.repeat(5000) });
    await expect(fetchCalendar(`${base}/big.ics`, { maxBytes: 1000 })).rejects.toThrow('larger than 1000 bytes');
    expect(await fetchCalendar(`${base}/big.ics`, { maxBytes: 5000 })).toHaveLength(5000);
  });
});
