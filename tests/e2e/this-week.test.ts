import { describe, expect, it } from 'vitest';
import { demoSession, hasBrowser, layoutShifts, recordShifts, shotOnFailure, signIn } from './support';

describe.skipIf(!hasBrowser)('the manager opens This week', () => {
  const demo = demoSession();

  it('shows the week in one piece: nothing already on screen is pushed down while it loads', async () => {
    const page = await demo.browser.newPage();
    await shotOnFailure(page, 'this-week', async () => {
      await page.addInitScript({ content: recordShifts });
      await signIn(page, demo.server.url, 'imogen@saltmarsh.test');
      await page.getByRole('link', { name: 'This week' }).click();
      await page.getByRole('heading', { name: /^Overdue/ }).waitFor();
      await page.getByRole('heading', { name: /^Out of service/ }).waitFor();
      await page.getByRole('heading', { name: /^Valves closing up \(\d+\)/ }).waitFor();
      await page.getByText('SM-07').first().waitFor();
      // Let late answers (technicians for the assignment boxes, the calendar feed) land.
      await page.waitForLoadState('networkidle');
      await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
      // web.dev Core Web Vitals: a CLS of 0.1 or less is "good".
      expect(await layoutShifts(page)).toBeLessThanOrEqual(0.1);
    });
    await page.close();
  });

  it('shows a long list of valve warnings a screenful at a time', async () => {
    const page = await demo.browser.newPage();
    await shotOnFailure(page, 'this-week-warnings', async () => {
      const items = Array.from({ length: 20 }, (_, i) => ({
        bikeId: '00000000-0000-4000-8000-000000000001',
        fleetNumber: `SM-${String(i + 1).padStart(2, '0')}`,
        valve: 'Cyl 1 exhaust',
        kmAtSpecMin: 20_000 + i,
        message: 'closing 0.0100 mm per 1,000 km',
      }));
      await page.route('**/api/valves/warnings', (route) => route.fulfill({ json: { items } }));
      await signIn(page, demo.server.url, 'imogen@saltmarsh.test');
      await page.getByRole('link', { name: 'This week' }).click();
      const section = page.getByRole('region', { name: /Valves closing up/ });
      await section.getByRole('heading', { name: 'Valves closing up (20)' }).waitFor();
      expect(await section.getByRole('listitem').count()).toBe(12);
      await section.getByRole('button', { name: 'Show all 20 valve warnings' }).click();
      expect(await section.getByRole('listitem').count()).toBe(20);
    });
    await page.close();
  });

  it('gives a task to a technician from the board, and the board keeps the choice', async () => {
    const page = await demo.browser.newPage();
    await shotOnFailure(page, 'this-week-assign', async () => {
      await signIn(page, demo.server.url, 'imogen@saltmarsh.test');
      await page.getByRole('link', { name: 'This week' }).click();
      const boxes = page.getByRole('combobox', { name: /^Technician for / });
      await expect.poll(() => boxes.first().isEnabled()).toBe(true);
      // The first row that can change hands: to a technician of its site, or back to nobody.
      const choices = await boxes.evaluateAll((els) =>
        els.map((el) => {
          const box = el as HTMLSelectElement;
          const other = [...box.options].find((o) => o.value !== box.value);
          return other ? { label: box.getAttribute('aria-label')!, value: other.value, text: other.textContent ?? '' } : null;
        }),
      );
      const index = choices.findIndex((c) => c !== null);
      expect(index).toBeGreaterThanOrEqual(0);
      const pick = choices[index]!;
      const label = pick.label;
      const box = boxes.nth(index);
      await box.selectOption(pick.value);
      const name = pick.value ? pick.text.replace(/ \(.*\)$/, '') : 'nobody';
      await page.getByText(new RegExp(`assigned to ${name}\\.`)).first().waitFor();
      // After the board has read the list again, the same row shows the same person.
      const same = page.getByRole('combobox', { name: label }).first();
      await expect.poll(() => same.inputValue()).toBe(pick.value);
      await expect.poll(() => same.isEnabled()).toBe(true);
    });
    await page.close();
  });
});
