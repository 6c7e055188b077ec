import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { hasBrowser, launchBrowser, shotOnFailure, signIn, startDemoServer, type Running } from './support';

interface Due { fleetNumber: string; item: string; status: string; remainingInUnit: number | null }

describe.skipIf(!hasBrowser)('the desk checks a bike in and the manager’s due list changes', () => {
  let server: Running;
  let desk: BrowserContext;
  let manager: BrowserContext;
  beforeAll(async () => {
    server = await startDemoServer();
    desk = await launchBrowser();
    manager = await launchBrowser();
  });
  afterAll(async () => {
    await desk?.close();
    await manager?.close();
    await server?.stop();
  });

  const dueOf = (page: Page) => page.evaluate(async () => (await (await fetch('/api/due?within=30')).json()).items as Due[]);

  it('walks a check-in past a due distance and sees the item turn overdue on This week', async () => {
    const m = await manager.newPage();
    const d = await desk.newPage();
    await shotOnFailure(m, 'check-in-manager', async () => {
      await signIn(m, server.url, 'imogen@saltmarsh.test');
      await m.getByRole('heading', { name: 'This week' }).waitFor();
      // A bike at the training ground whose chain is due within days, by distance.
      const before = (await dueOf(m)).find((x) => x.fleetNumber === 'SM-20' && x.item.startsWith('Chain'));
      expect(before?.status).toBe('soon');
      const overdue = m.getByRole('region', { name: 'Overdue' });
      expect(await overdue.getByText('SM-20').count()).toBe(0);

      await shotOnFailure(d, 'check-in-desk', async () => {
        await signIn(d, server.url, 'ruth@saltmarsh.test');
        await d.getByLabel('Fleet number or registration').fill('SM-20');
        await d.getByRole('list', { name: 'Matching bikes' }).getByRole('button').first().click();
        const latest = await d.evaluate(async () => {
          const bikes = (await (await fetch('/api/bikes?q=SM-20')).json()).items as { latestOdometer: number }[];
          return bikes[0].latestOdometer;
        });
        await d.getByLabel('Odometer now').fill(String(Math.ceil(latest + before!.remainingInUnit! + 20)));
        await d.getByRole('button', { name: 'Save check-in' }).click();
        const confirm = d.getByRole('button', { name: 'Yes, the reading is right' });
        if (await confirm.isVisible().catch(() => false)) await confirm.click();
        // Depending on the hour, the demo plan may have SM-20 in the workshop later today: the desk
        // is then asked before the bike goes out, and answers that it goes out.
        const verdict = d.getByText(/May go out|Do not hand this bike to a rider/).first();
        const handOut = d.getByRole('button', { name: 'Yes, hand it out' });
        await verdict.or(handOut).first().waitFor();
        if (await handOut.isVisible().catch(() => false)) await handOut.click();
        await verdict.waitFor();
      });

      await m.reload();
      await m.getByRole('heading', { name: 'This week' }).waitFor();
      await expect.poll(async () => (await dueOf(m)).find((x) => x.fleetNumber === 'SM-20' && x.item.startsWith('Chain'))?.status).toBe('overdue');
      await overdue.getByText('SM-20').first().waitFor();
    });
  });
});
