import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { simpleParser } from 'mailparser';
import { eq } from 'drizzle-orm';
import { agent, manualClock, testApp, type Agent, type TestContext } from '../support/test-app';
import { PASSWORD, makeServiceItem, world } from '../support/factories';
import { jobRuns, outbox } from '../../server/db/schema';
import { isoWeekLabel } from '../../jobs/weekly-digest';
import { MAX_ATTEMPTS, backoffMinutes } from '../../server/mail/outbox';
import { slotClaimer } from '../../jobs/claim';
import { openDatabase } from '../../server/db/client';

const clock = manualClock('2026-06-15T06:00:00Z');
let t: TestContext;
let w: Awaited<ReturnType<typeof world>>;
let admin: Agent;
beforeAll(async () => {
  t = await testApp({ now: clock.now, withMail: true, jobToken: 'local-job-token-for-tests-000000' });
  w = await world(t.database.db);
  await makeServiceItem(t.database.db, w.model.id, { name: 'Engine oil', everyKm: 5000, everyMonths: 6 });
  admin = await agent(t.app);
  await admin.login(w.people.admin.email, PASSWORD);
});
afterAll(() => t.close());

// A week later the session is past its absolute lifetime: sign in afresh.
async function signInAgain() {
  admin = await agent(t.app);
  await admin.login(w.people.admin.email, PASSWORD);
}

describe('ISO week label', () => {
  it('follows ISO 8601 week numbering (checked against date-fns getISOWeek)', () => {
    // 2026-12-31 is a Thursday: ISO week 53 of 2026. 2027-01-01 (Friday) is still 2026-W53.
    expect(isoWeekLabel('2026-12-31')).toBe('2026-W53');
    expect(isoWeekLabel('2027-01-01')).toBe('2026-W53');
    expect(isoWeekLabel('2026-06-15')).toBe('2026-W25');
  });
});

describe('claimed time slots', () => {
  const now = new Date('2026-06-15T05:30:00Z');
  const runOf = async (slot: string) => (await t.database.db.select().from(jobRuns).where(eq(jobRuns.slot, slot)))[0];

  it('runs a slot once: a repeat in the same process, or another live claimer, skips it', async () => {
    const a = slotClaimer(t.database, 'process-a');
    const run = await a.claim('due-scan', 'slot-once', now);
    expect(run).not.toBeNull();
    expect(await a.claim('due-scan', 'slot-once', now)).toBeNull();
    await run!.finish({ summary: 'done' }, now);
    expect(await a.claim('due-scan', 'slot-once', now)).toBeNull();
    expect(await slotClaimer(t.database, 'process-b').claim('due-scan', 'slot-once', now)).toBeNull();
    expect((await runOf('slot-once')).finishedAt).not.toBeNull();
  });

  it('lets a failed run go, so the next claim runs it again', async () => {
    const a = slotClaimer(t.database, 'process-a');
    await (await a.claim('due-scan', 'slot-failed', now))!.abandon('disk full');
    expect((await runOf('slot-failed')).result).toEqual({ error: 'disk full' });
    const again = await a.claim('due-scan', 'slot-failed', now);
    expect(again).not.toBeNull();
    await again!.finish({ summary: 'done' }, now);
  });

  it.skipIf(process.env.LASHLINE_TEST_DB === 'postgres')(
    'on embedded PGlite, a run left unfinished by an earlier start of the server is claimed at once',
    async () => {
      // Only one process can hold the data directory, so another owner's unfinished run died with it.
      const before = slotClaimer(t.database, 'first-start');
      expect(await before.claim('due-scan', 'slot-killed', now)).not.toBeNull();
      const after = slotClaimer(t.database, 'second-start');
      const run = await after.claim('due-scan', 'slot-killed', now);
      expect(run).not.toBeNull();
      expect((await runOf('slot-killed')).owner).toBe('second-start');
      expect(await after.claim('due-scan', 'slot-killed', now)).toBeNull();
      await run!.finish({ summary: 'done' }, now);
    },
  );

  it.skipIf(process.env.LASHLINE_TEST_DB !== 'postgres')(
    'on PostgreSQL, a live run holds its slot against other instances; once its connection dies the slot is claimed at once',
    async () => {
      const other = await openDatabase({ databaseUrl: process.env.TEST_DATABASE_URL!, migrate: false });
      // The first instance names its connections, so only its own is ended below: other test runs
      // (the browser tests' servers) may hold claims on the same database at the same moment.
      const name = `lashline-claim-test-${process.pid}-${Date.now()}`;
      const url = new URL(process.env.TEST_DATABASE_URL!);
      url.searchParams.set('application_name', name);
      const mine = await openDatabase({ databaseUrl: url.toString(), migrate: false });
      try {
        const first = slotClaimer(mine, 'instance-1');
        const second = slotClaimer(other, 'instance-2');
        const dying = await first.claim('due-scan', 'slot-killed', now);
        expect(dying).not.toBeNull();
        expect(await second.claim('due-scan', 'slot-killed', now)).toBeNull();
        // The first instance dies: its connection, and the row lock it held, go with it.
        const killed = await other.pool!.query(
          `select pg_terminate_backend(pid) from pg_stat_activity where datname = current_database() and application_name = $1 and state like 'idle in transaction%' and query like '%skip locked%'`,
          [name],
        );
        expect(killed.rowCount).toBe(1);
        const run = await second.claim('due-scan', 'slot-killed', now);
        expect(run).not.toBeNull();
        expect(await first.claim('due-scan', 'slot-killed', now)).toBeNull();
        // The first instance, had it lived on, would learn it lost the slot instead of recording a result.
        await expect(dying!.finish({ summary: 'late' }, now)).rejects.toThrow(/lost/);
        await run!.finish({ summary: 'done' }, now);
        expect((await runOf('slot-killed')).owner).toBe('instance-2');
        expect((await runOf('slot-killed')).result).toEqual({ summary: 'done' });
      } finally {
        await other.close();
        await mine.close().catch(() => undefined);
      }
    },
  );
});

describe('jobs run by an administrator', () => {
  it('runs the due scan now and answers with what it did', async () => {
    const res = await admin.post('/api/admin/jobs/due-scan/run');
    expect(res.status).toBe(200);
    expect(res.body.result.summary).toMatch(/Scanned \d+ bikes/);
    expect((await admin.post('/api/admin/jobs/no-such-job/run')).status).toBe(404);
  });

  it('is refused to a manager and to a signed-out caller without the local job token', async () => {
    const m = await agent(t.app);
    await m.login(w.people.manager.email, PASSWORD);
    expect((await m.post('/api/admin/jobs/due-scan/run')).status).toBe(403);
    expect((await request(t.app).post('/api/admin/jobs/due-scan/run')).status).toBe(403);
    const local = await request(t.app).post('/api/admin/jobs/due-scan/run').set('x-lashline-job-token', 'local-job-token-for-tests-000000');
    expect(local.status).toBe(200);
  });
});

describe('the weekly due list by e-mail', () => {
  it('arrives in the mail catcher once per manager and week, with text and HTML parts (RFC 5322, read by mailparser)', async () => {
    const first = await admin.post('/api/admin/jobs/weekly-digest/run');
    expect(first.body.result).toMatchObject({ queued: 1, sent: 1 });
    const again = await admin.post('/api/admin/jobs/weekly-digest/run');
    expect(again.body.result).toMatchObject({ queued: 0, sent: 0 });
    const list = await admin.get('/api/admin/mail');
    expect(list.body.items).toHaveLength(1);
    expect(list.body.items[0]).toMatchObject({ to: w.people.manager.email });
    const raw = await admin.get(`/api/admin/mail/${list.body.items[0].id}/raw`);
    expect(raw.headers['content-type']).toMatch(/message\/rfc822/);
    const parsed = await simpleParser(raw.text);
    expect(parsed.subject).toContain('2026-W25');
    expect(parsed.text).toContain('Overdue');
    // The coming week's workshop plan for each of the manager's sites: one line a day, capacity used, work not placed.
    const planBlocks = (parsed.text ?? '').split('\n').filter((l) => /^Workshop plan at .+, next 7 days$/.test(l));
    expect(planBlocks.length).toBe(2); // the manager runs both sites of the test world
    const dayLines = (parsed.text ?? '').split('\n').filter((l) => /^- \d{4}-\d{2}-\d{2}: \d+ visits?, [\d.,]+ h of [\d.,]+ h/.test(l));
    expect(dayLines.length).toBe(7 * planBlocks.length);
    expect(parsed.text).toMatch(/Not placed \(\d+\)/);
    expect(typeof parsed.html).toBe('string');
    expect(parsed.html).toContain('Open the plan board');
    const shown = await admin.get(`/api/admin/mail/${list.body.items[0].id}`);
    expect(shown.body.message.html).toContain('Due this week');
  });

  it('keeps a message in the outbox while the mail server refuses, retries with back-off, and sends it once', async () => {
    clock.set('2026-06-22T06:00:00Z');
    await signInAgain();
    t.catcher!.setRefusing(true);
    const res = await admin.post('/api/admin/jobs/weekly-digest/run');
    expect(res.body.result).toMatchObject({ queued: 1, sent: 0, retrying: 1 });
    const [queued] = await t.database.db.select().from(outbox).where(eq(outbox.dedupeKey, `digest:2026-W26:${w.people.manager.id}`));
    expect(queued).toMatchObject({ status: 'pending', attempts: 1 });
    expect(queued.nextAttemptAt.getTime() - clock.now().getTime()).toBe(backoffMinutes(1) * 60_000);
    // Before the back-off has passed, nothing is tried.
    expect((await admin.post('/api/admin/jobs/deliver-mail/run')).body.result.sent).toBe(0);
    t.catcher!.setRefusing(false);
    clock.advance(backoffMinutes(1) * 60_000);
    expect((await admin.post('/api/admin/jobs/deliver-mail/run')).body.result.sent).toBe(1);
    expect((await admin.post('/api/admin/jobs/deliver-mail/run')).body.result.sent).toBe(0);
    const mails = (await admin.get('/api/admin/mail')).body.items.filter((m: { subject: string }) => m.subject.includes('2026-W26'));
    expect(mails).toHaveLength(1);
  });

  it('gives up after the last try and shows the message as failed', async () => {
    clock.set('2026-06-29T06:00:00Z');
    await signInAgain();
    t.catcher!.setRefusing(true);
    await admin.post('/api/admin/jobs/weekly-digest/run');
    for (let i = 1; i < MAX_ATTEMPTS; i++) {
      clock.advance(backoffMinutes(i) * 60_000);
      await admin.post('/api/admin/jobs/deliver-mail/run');
    }
    t.catcher!.setRefusing(false);
    const box = (await admin.get('/api/admin/mail/outbox')).body.items;
    const failed = box.find((m: { subject: string }) => m.subject.includes('2026-W27'));
    expect(failed).toMatchObject({ status: 'failed', attempts: MAX_ATTEMPTS });
    expect(failed.lastError).toBeTruthy();
  });
});
