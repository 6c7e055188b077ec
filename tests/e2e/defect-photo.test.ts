import { describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { demoSession, hasBrowser, shotOnFailure, signIn } from './support';

describe.skipIf(!hasBrowser)('the desk reports a worn tyre with a photo and the bike is grounded', () => {
  const demo = demoSession();

  it('records the defect, grounds the bike, attaches the photo and refuses the bike to the next rider', async () => {
    const page = await demo.browser.newPage();
    await shotOnFailure(page, 'defect-photo', async () => {
      await signIn(page, demo.server.url, 'cal@saltmarsh.test');
      await page.getByLabel('Fleet number or registration').fill('SM-12');
      await page.getByRole('list', { name: 'Matching bikes' }).getByRole('button').first().click();
      const latest = await page.evaluate(async () => (await (await fetch('/api/bikes?q=SM-12')).json()).items[0].latestOdometer as number);
      await page.getByLabel('Odometer now').fill(String(Math.ceil(latest + 35)));
      await page.getByRole('button', { name: 'Report a defect' }).click();
      await page.getByLabel('What does it concern?').selectOption('tyres');
      await page.getByLabel('What is wrong?').fill('Rear tyre worn to the wear bars on the left shoulder');
      await page.getByText('Safety-critical: take the bike out of service.').click();
      await page.getByRole('button', { name: 'Save check-in' }).click();
      await page.getByText('Do not hand this bike to a rider').first().waitFor();
      await page.getByText(/bike is now grounded/).waitFor();
      const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#3a3a3a' } }).jpeg().toBuffer();
      await page.getByRole('region', { name: 'Photo of the defect' }).locator('input[type=file]').first().setInputFiles({ name: 'rear-tyre.jpg', mimeType: 'image/jpeg', buffer: photo });
      await expect
        .poll(async () => page.evaluate(async () => {
          const bike = (await (await fetch('/api/bikes?q=SM-12')).json()).items[0];
          const files = await (await fetch(`/api/bikes/${bike.id}/attachments`)).json();
          return { status: bike.status, photos: (files.items ?? []).length };
        }), { timeout: 15_000 })
        .toEqual({ status: 'out_of_service', photos: 1 });
      // The next time anyone picks the bike at the counter, the refusal comes first.
      await page.goto(`${demo.server.url}/check-in`);
      await page.getByLabel('Fleet number or registration').fill('SM-12');
      await page.getByRole('list', { name: 'Matching bikes' }).getByRole('button').first().click();
      await page.getByText('Do not hand this bike to a rider').first().waitFor();
      await page.getByText(/Rear tyre worn/).first().waitFor();
    });
  });
});
