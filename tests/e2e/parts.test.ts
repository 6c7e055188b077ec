import { describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { demoSession, fetchJson, hasBrowser, layoutShifts, recordShifts, shotOnFailure, signIn } from './support';

const FILTER = 'Oil filter, 250–400 cc';

async function openQuayStreet(page: Page, url: string) {
  const sites = (await fetchJson(page, '/api/sites')).items as { id: string; name: string }[];
  const quay = sites.find((s) => s.name === 'Quay Street')!;
  await page.goto(`${url}/parts?site=${quay.id}`);
  return quay.id;
}

/** The shelf's row for one part, as the cells' text. */
const shelfRow = (page: Page, name: string) => page.getByRole('table', { name: 'Parts on the shelf at this site' }).getByRole('row').filter({ hasText: name });

describe.skipIf(!hasBrowser)('the parts person at Quay Street', () => {
  const demo = demoSession();

  it('sees the empty shelf of 250–400 cc filters flagged before delivery, with nothing pushed down while the page loads', async () => {
    const page = await demo.browser.newPage();
    await shotOnFailure(page, 'parts-shelf', async () => {
      await page.addInitScript({ content: recordShifts });
      await signIn(page, demo.server.url, 'imogen@saltmarsh.test');
      await page.getByRole('navigation', { name: 'Main' }).waitFor();
      await openQuayStreet(page, demo.server.url);
      await shelfRow(page, FILTER).waitFor();
      await expect.poll(() => shelfRow(page, FILTER).innerText()).toMatch(/Below minimum: 3 short/);
      const forecastRow = page.getByRole('table', { name: /Forecast need per week/ }).getByRole('row').filter({ hasText: FILTER });
      await forecastRow.waitFor();
      expect(await forecastRow.innerText()).toMatch(/Runs out before an order placed today can arrive \(lead time 7 days\)/);
      await page.getByRole('heading', { name: 'Orders', level: 2 }).waitFor();
      await page.waitForLoadState('networkidle');
      await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
      // web.dev Core Web Vitals: a CLS of 0.1 or less is "good".
      expect(await layoutShifts(page)).toBeLessThanOrEqual(0.1);
      // The part's chart, loaded on request: on hand against the cumulative need, with the week it runs out.
      await forecastRow.getByRole('button', { name: new RegExp(FILTER) }).click();
      const chart = page.getByRole('region', { name: new RegExp(FILTER) });
      await chart.locator('svg.recharts-surface').first().waitFor();
      expect(await chart.innerText()).toMatch(/Red line: the week it runs out/);
    });
    await page.close();
  });

  it('sends the draft order, books in part of it, and the shelf moves by exactly what arrived', async () => {
    const page = await demo.browser.newPage();
    await shotOnFailure(page, 'parts-order', async () => {
      await signIn(page, demo.server.url, 'imogen@saltmarsh.test');
      await page.getByRole('navigation', { name: 'Main' }).waitFor();
      const siteId = await openQuayStreet(page, demo.server.url);
      const order = page.getByRole('article', { name: /PO-0001/ });
      await order.waitFor();
      const before = (await fetchJson(page, `/api/stock?site=${siteId}`)).items.find((i: { name: string }) => i.name === FILTER) as { onHand: number; onOrder: number };
      await order.getByRole('button', { name: /^Send to / }).click();
      await page.getByText(/PO-0001 sent to .* \(.*@.*\)\./).first().waitFor();
      await order.getByRole('button', { name: 'Receive' }).click();
      const form = page.getByRole('form', { name: 'Receive PO-0001' });
      await form.getByLabel(`${FILTER} arrived`).fill('4');
      await form.getByRole('button', { name: 'Book in what arrived' }).click();
      await page.getByText('PO-0001: booked in. Some is still to come.').first().waitFor();
      await expect.poll(() => order.innerText()).toMatch(/6 to come/);
      await expect.poll(async () => ((await fetchJson(page, `/api/stock?site=${siteId}`)).items.find((i: { name: string }) => i.name === FILTER) as { onHand: number }).onHand).toBe(before.onHand + 4);
      await expect.poll(() => shelfRow(page, FILTER).innerText()).toMatch(/\b4\b/);
      // More than is still due is refused in words, and nothing is booked.
      await order.getByRole('button', { name: 'Receive' }).click();
      await form.getByLabel(`${FILTER} arrived`).fill('7');
      await form.getByRole('button', { name: 'Book in what arrived' }).click();
      await form.getByRole('alert').waitFor();
      expect(await form.getByRole('alert').innerText()).toMatch(/more than|still due|ordered/i);
      const after = (await fetchJson(page, `/api/stock?site=${siteId}`)).items.find((i: { name: string }) => i.name === FILTER) as { onHand: number };
      expect(after.onHand).toBe(before.onHand + 4);
    });
    await page.close();
  });
});
