import { describe, expect, it } from 'vitest';
import ICAL from 'ical.js';
import type { Locator, Page } from 'playwright-core';
import { demoSession, fetchJson, hasBrowser, shotOnFailure, signIn } from './support';
import type { PlanAnswer, PlanVisit } from '../../shared/schemas/plan';
import { startOfDayInZone, todayInZone } from '../../shared/domain/dates';

const ZONE = 'Europe/London';
const MINUTE = 60_000;

/** Asks the API from inside the signed-in page, with the session's CSRF token for writes. */
async function send(page: Page, method: string, url: string, body?: unknown) {
  return page.evaluate(
    async ({ method, url, body }) => {
      const { token } = await (await fetch('/api/auth/csrf')).json();
      const res = await fetch(url, { method, headers: { 'content-type': 'application/json', 'x-csrf-token': token }, body: body === undefined ? undefined : JSON.stringify(body) });
      return { status: res.status, body: await res.json() };
    },
    { method, url, body },
  );
}

/** The same wall-clock time as `iso`, on another day at the site. */
const sameTimeOn = (iso: string, day: string) => {
  const t = Date.parse(iso);
  return new Date(startOfDayInZone(day, ZONE) + (t - startOfDayInZone(todayInZone(ZONE, new Date(t)), ZONE))).toISOString();
};
const overlaps = (a0: number, a1: number, b0: number, b1: number) => a0 < b1 && b0 < a1;

/**
 * Places a visit could move to at its site, keeping its time of day: a day after today, not after
 * its latest day, that its technician works in full, on a bay that is free then, with the
 * technician and the bike free too and no booking of the bike or of its model then. One place per
 * day, the visit's own bay first.
 */
function freePlaces(plan: PlanAnswer, v: PlanVisit, modelId: string) {
  const length = Date.parse(v.end) - Date.parse(v.start);
  const today = todayInZone(ZONE, new Date());
  const bays = [v.bayId, ...plan.bays.filter((b) => b.siteId === v.siteId && b.id !== v.bayId).map((b) => b.id)];
  return plan.capacity
    .filter((c) => c.siteId === v.siteId && c.date > today && c.date <= v.latestDate && c.date !== todayInZone(ZONE, new Date(v.start)) && c.availableMinutes >= 480)
    .flatMap((c) => {
      const s = Date.parse(sameTimeOn(v.start, c.date));
      const e = s + length;
      const busy = (o: PlanVisit) => o.id !== v.id && overlaps(s, e, Date.parse(o.start), Date.parse(o.end));
      const clash = plan.visits.some((o) => busy(o) && (o.technicianId === v.technicianId || o.bikeId === v.bikeId));
      const booked = plan.bookings.some((b) => (b.bikeId === v.bikeId || (!b.bikeId && b.modelId === modelId)) && overlaps(s, e, Date.parse(b.start), Date.parse(b.end)));
      // The technician's working day must hold the whole visit at that time (shifts end at 16:30).
      const endsBy = startOfDayInZone(c.date, ZONE) + (16 * 60 + 30) * MINUTE;
      if (clash || booked || e > endsBy) return [];
      const bayId = bays.find((bay) => !plan.visits.some((o) => busy(o) && o.bayId === bay));
      return bayId ? [{ day: c.date, bayId }] : [];
    });
}

/** Drags with the mouse as a person does: press, move in steps past the drag threshold, release. */
async function drag(page: Page, from: Locator, to: Locator) {
  await from.scrollIntoViewIfNeeded();
  const a = (await from.boundingBox())!;
  await page.mouse.move(a.x + a.width / 2, a.y + 12);
  await page.mouse.down();
  await page.mouse.move(a.x + a.width / 2 + 10, a.y + 20, { steps: 4 });
  // The board scrolls sideways on a narrow screen: bring the target into view while holding the block.
  await to.scrollIntoViewIfNeeded();
  const b = (await to.boundingBox())!;
  await page.mouse.move(b.x + b.width / 2, b.y + Math.min(30, b.height / 2), { steps: 12 });
  await page.mouse.up();
}

async function calendarEvent(page: Page, visitId: string) {
  const { url } = await fetchJson(page, '/api/calendar/feed');
  const ics = await page.evaluate(async (u) => (await fetch(new URL(u).pathname)).text(), url as string);
  // Read back with ical.js, a general iCalendar (RFC 5545) parser.
  const cal = new ICAL.Component(ICAL.parse(ics));
  const ev = cal.getAllSubcomponents('vevent').find((e) => e.getFirstPropertyValue('uid') === `visit-${visitId}@lashline`);
  return ev && { sequence: Number(ev.getFirstPropertyValue('sequence') ?? 0), start: (ev.getFirstPropertyValue('dtstart') as ICAL.Time).toJSDate().toISOString() };
}

describe.skipIf(!hasBrowser)('the manager moves a visit on the plan board', () => {
  const demo = demoSession();

  it('is refused with the reason on a day the bike is hired out; on a free day the technician’s day and the calendar feed follow', async () => {
    const page = await demo.browser.newPage();
    // Wide enough for the board's two weeks side by side, so a drag needs no scrolling.
    await page.setViewportSize({ width: 2900, height: 1400 });
    await shotOnFailure(page, 'plan-board', async () => {
      await signIn(page, demo.server.url, 'imogen@saltmarsh.test');
      await page.getByRole('link', { name: 'Plan', exact: true }).waitFor();
      // The scheduler's catch-up due scan raises the demo's tasks and plans them just after start.
      const sites = ((await fetchJson(page, '/api/sites')).items as { id: string; name: string }[]).filter((s) => s.name === 'Quay Street');
      let plan: PlanAnswer | undefined;
      for (let i = 0; i < 60 && !plan?.visits.length; i++) {
        plan = (await fetchJson(page, `/api/plan?site=${sites[0].id}`)) as PlanAnswer;
        if (!plan.visits.length) await page.waitForTimeout(500);
      }
      expect(plan!.visits.length, 'the demo plan has visits').toBeGreaterThan(0);

      // A visit with two free days ahead of it: the bike is then hired out on the first.
      const bikes = (await fetchJson(page, `/api/bikes?siteId=${sites[0].id}`)).items as { id: string; model: { id: string } }[];
      const modelOf = new Map(bikes.map((b) => [b.id, b.model.id]));
      const candidates = plan!.visits
        .filter((v) => !v.pinned && todayInZone(ZONE, new Date(v.start)) > todayInZone(ZONE, new Date()))
        .map((v) => ({ v, days: freePlaces(plan!, v, modelOf.get(v.bikeId)!) }));
      const pick = candidates.find((c) => c.days.length >= 2);
      expect(pick, `a visit with two free days to move to; plan of ${plan!.plannedAt}, ${plan!.visits.length} visits: ${JSON.stringify(candidates.map((c) => [c.v.start, c.v.latestDate, c.days]))}`).toBeDefined();
      const { v } = pick!;
      const [hired, free] = pick!.days;
      const [hiredDay, freeDay] = [hired.day, free.day];
      const hire = await send(page, 'POST', '/api/bookings', {
        siteId: v.siteId,
        kind: 'hire',
        bikeId: v.bikeId,
        start: new Date(startOfDayInZone(hiredDay, ZONE) + 7 * 60 * MINUTE).toISOString(),
        end: new Date(startOfDayInZone(hiredDay, ZONE) + 19 * 60 * MINUTE).toISOString(),
        title: 'Estuary day ride',
      });
      expect(hire.status, JSON.stringify(hire.body)).toBe(201);
      const before = (await fetchJson(page, `/api/plan?site=${v.siteId}`)) as PlanAnswer;
      const visit = before.visits.find((x) => x.id === v.id)!;
      expect(visit.start, 'the new hire leaves the visit where it was').toBe(v.start);
      const eventBefore = await calendarEvent(page, v.id);
      expect(eventBefore?.start).toBe(v.start);

      await page.goto(`${demo.server.url}/plan?site=${v.siteId}`);
      const block = page.getByTestId(`visit-${v.id}`);
      await block.waitFor();

      // Onto the hired day: refused in words, the block goes back, nothing saved.
      await drag(page, block, page.getByTestId(`cell-${hired.bayId}|${hiredDay}`));
      const refusal = page.getByTestId('move-refusal');
      await refusal.waitFor();
      expect(await refusal.innerText()).toMatch(/on hire 'Estuary day ride'/);
      expect(await page.getByTestId(`cell-${v.bayId}|${todayInZone(ZONE, new Date(v.start))}`).getByTestId(`visit-${v.id}`).count()).toBe(1);
      const unchanged = ((await fetchJson(page, `/api/plan?site=${v.siteId}`)) as PlanAnswer).visits.find((x) => x.id === v.id)!;
      expect([unchanged.start, unchanged.sequence]).toEqual([visit.start, visit.sequence]);

      // Onto a free day: saved, the block stands there.
      await drag(page, page.getByTestId(`visit-${v.id}`), page.getByTestId(`cell-${free.bayId}|${freeDay}`));
      await page.getByTestId(`cell-${free.bayId}|${freeDay}`).getByTestId(`visit-${v.id}`).waitFor();
      const newStart = sameTimeOn(v.start, freeDay);
      const moved = ((await fetchJson(page, `/api/plan?site=${v.siteId}`)) as PlanAnswer).visits.find((x) => x.id === v.id)!;
      expect([moved.start, moved.sequence, moved.pinned]).toEqual([newStart, visit.sequence + 1, true]);

      // The manager's calendar feed: the same UID, the new start, SEQUENCE one higher (RFC 5545 §3.8.7.4).
      const eventAfter = await calendarEvent(page, v.id);
      expect(eventAfter).toEqual({ start: newStart, sequence: eventBefore!.sequence + 1 });

      // The technician's day: the visit is on the new day, gone from the old one.
      const techPage = await demo.browser.newPage();
      await signIn(techPage, demo.server.url, 'tomasz@saltmarsh.test');
      await techPage.getByRole('button', { name: 'Sign out' }).waitFor();
      const me = await fetchJson(techPage, '/api/auth/me');
      expect(me.user.id).toBe(v.technicianId);
      const onNew = await fetchJson(techPage, `/api/plan/my-day?date=${freeDay}`);
      const onOld = await fetchJson(techPage, `/api/plan/my-day?date=${todayInZone(ZONE, new Date(v.start))}`);
      expect(onNew.visits.map((x: PlanVisit) => x.id)).toContain(v.id);
      expect(onOld.visits.map((x: PlanVisit) => x.id)).not.toContain(v.id);
      expect((await calendarEvent(techPage, v.id))?.start).toBe(newStart);
      await techPage.close();
    });
    await page.close();
  });
});
