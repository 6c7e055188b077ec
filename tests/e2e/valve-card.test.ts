import { describe, expect, it } from 'vitest';
import { demoSession, fetchJson, fillSm01ValveCard, hasBrowser, shotOnFailure, signIn } from './support';

const json = fetchJson;

describe.skipIf(!hasBrowser)('a technician works a valve card on a Ridgeback', () => {
  const demo = demoSession();

  it('types readings, sees the shim advice and plan, signs off, and stock and the next due date change', async () => {
    const page = await demo.browser.newPage();
    await shotOnFailure(page, 'valve-card', async () => {
      await signIn(page, demo.server.url, 'tomasz@saltmarsh.test');
      await page.getByRole('heading', { name: /tasks/i }).first().waitFor();
      // The closing cylinder-2 exhaust valves of SM-01 brought its valve check forward.
      const tasks = (await json(page, '/api/tasks?status=active')).items as { id: string; fleetNumber: string; category: string; origin: string; bikeId: string; siteId: string }[];
      const task = tasks.find((x) => x.fleetNumber === 'SM-01' && x.category === 'valves')!;
      expect(task.origin).toBe('trend');
      const stockBefore = (await json(page, `/api/stock/shims?siteId=${task.siteId}`)).items as { sizeMm: number; condition: string; count: number }[];
      const used260 = (s: typeof stockBefore) => s.find((x) => x.sizeMm === 2.6 && x.condition === 'used')?.count ?? 0;
      const dueBefore = (await json(page, `/api/bikes/${task.bikeId}`)).due.find((d: { category: string }) => d.category === 'valves');

      await page.goto(`${demo.server.url}/tasks/${task.id}/valves`);
      await page.getByRole('heading', { name: 'Cylinder 1 intake 1' }).waitFor();
      await page.getByRole('button', { name: /Start: bike into the workshop/ }).click();
      const tight = await fillSm01ValveCard(page);
      // New shim = 2.60 + 0.18 − 0.25 = 2.53 mm; of the 0.05 mm series, 2.55 mm leaves 0.23 mm, nearest the middle (common practice).
      await tight.getByText(/2\.55/).first().waitFor();
      await page.getByText('Shim plan for the whole engine').waitFor();
      await tight.getByLabel('Shim fitted (empty if unchanged)').fill('255');
      await tight.getByLabel(/As left, measured after adjusting/).fill('0.23');
      await page.getByRole('button', { name: 'Sign off the valve check' }).click();
      await page.getByText(/Next valve check/).waitFor();

      const stockAfter = (await json(page, `/api/stock/shims?siteId=${task.siteId}`)).items;
      expect(used260(stockAfter)).toBe(used260(stockBefore) + 1);
      const dueAfter = (await json(page, `/api/bikes/${task.bikeId}`)).due.find((d: { category: string }) => d.category === 'valves');
      expect(dueAfter.lastDoneDate > dueBefore.lastDoneDate).toBe(true);
      expect(dueAfter.dueAtKm).toBeGreaterThan(dueBefore.dueAtKm);
    });
  });
});
