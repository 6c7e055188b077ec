import { describe, expect, it } from 'vitest';
import { demoSession, hasBrowser, launchBrowser, shotOnFailure, signIn } from './support';

describe.skipIf(!hasBrowser)('the manager signs in and sees the fleet register', () => {
  const demo = demoSession();

  it('lists the demo fleet, filters it, and opens a bike', async () => {
    const page = await demo.browser.newPage();
    await shotOnFailure(page, 'fleet-register', async () => {
      await signIn(page, demo.server.url, 'imogen@saltmarsh.test');
      await page.getByRole('link', { name: 'Fleet', exact: true }).click();
      await page.getByRole('heading', { name: 'Fleet' }).waitFor();
      const table = page.getByRole('table', { name: 'Fleet register' });
      await table.getByRole('link', { name: 'SM-01' }).waitFor();
      expect(await table.locator('tbody tr').count()).toBeGreaterThanOrEqual(20);
      await page.getByLabel('Search').fill('SM-07');
      await expect.poll(() => table.locator('tbody tr').count()).toBe(1);
      await table.getByRole('link', { name: 'SM-07' }).click();
      await page.getByRole('heading', { name: 'SM-07' }).waitFor();
      await page.getByRole('heading', { name: 'Odometer history' }).waitFor();
    });
  });

  it('keeps the desk out of administration', async () => {
    const page = await (await launchBrowser()).newPage();
    await signIn(page, demo.server.url, 'cal@saltmarsh.test');
    // The desk lands on the check-in screen, its first screen.
    await page.getByRole('heading', { name: 'Check-in' }).waitFor();
    expect(await page.getByRole('link', { name: 'Fleet', exact: true }).count()).toBe(1);
    expect(await page.getByRole('link', { name: 'People' }).count()).toBe(0);
    await page.context().close();
  });
});
