import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import sharp from 'sharp';
import { AxeBuilder } from '@axe-core/playwright';
import type { Result } from 'axe-core';
import type { BrowserContext, Page } from 'playwright-core';
import { fetchJson, hasBrowser, launchBrowser, shotOnFailure, signIn, startDemoServer, type Running } from './support';

// axe-core's tags for the success criteria of WCAG 2.0, 2.1 and 2.2 at levels A and AA.
const WCAG_AA = ['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa', 'wcag22a', 'wcag22aa'];

/** The rule, what it asks for, and the elements that break it, for whoever reads the CI log. */
const report = (vs: Result[]) =>
  vs
    .map((v) => `${v.id} (${v.impact}): ${v.help}\n  ${v.helpUrl}\n${v.nodes.map((n) => `    ${n.target.join(' > ')}\n      ${n.failureSummary?.replace(/\n/g, '\n      ')}`).join('\n')}`)
    .join('\n');

/** Waits for the screen's own content (its data loaded, no spinner left), then checks it with axe-core. */
async function check(page: Page, name: string, ready: (p: Page) => Promise<unknown>) {
  await shotOnFailure(page, `a11y-${name.replace(/\W+/g, '-')}`, async () => {
    await ready(page);
    // Late answers land first. A sandboxed frame (the mail preview) never reports the network idle,
    // so this wait is bounded; the screen's own ready check has already seen its data.
    await page.waitForLoadState('networkidle', { timeout: 5_000 }).catch(() => undefined);
    await expect.poll(() => page.getByRole('status').filter({ hasText: /^Loading/ }).count(), { timeout: 20_000 }).toBe(0);
    // A frame that may run no script (the mail preview) cannot be entered by axe and would stall it;
    // the message in it is checked as a page of its own.
    const { passes, violations } = await new AxeBuilder({ page }).withTags(WCAG_AA).exclude('iframe[sandbox=""]').analyze();
    // The check saw the screen's text: contrast was measured on it, not skipped over an empty page.
    expect(passes.find((r) => r.id === 'color-contrast')?.nodes.length ?? 0, `${name}: no text was checked`).toBeGreaterThan(0);
    const serious = violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
    // Soft, so a test reports every one of its screens that fails, not only the first.
    expect.soft(serious.map((v) => v.id), `${name}:\n${report(serious)}`).toEqual([]);
  });
}

const heading = (p: Page, name: string | RegExp) => p.getByRole('heading', { name, level: 1 }).waitFor();

describe.skipIf(!hasBrowser)('every main screen passes axe-core’s WCAG 2.2 A and AA checks', () => {
  let server: Running;
  let browser: BrowserContext;
  beforeAll(async () => {
    server = await startDemoServer();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });

  /** A fresh page signed in as one of the demo people; closed with its test. */
  async function as(email: string) {
    await browser.clearCookies();
    const page = await browser.newPage();
    await signIn(page, server.url, email);
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    return page;
  }
  const go = async (page: Page, path: string) => page.goto(`${server.url}${path}`);

  it('sign-in', async () => {
    await browser.clearCookies();
    const page = await browser.newPage();
    await go(page, '/sign-in');
    await check(page, 'sign-in', (p) => p.getByRole('button', { name: 'Sign in' }).waitFor());
    // A refused sign-in shows its error on the same screen.
    await page.getByLabel('E-mail').fill('nobody@saltmarsh.test');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await check(page, 'sign-in refused', (p) => p.getByRole('alert').first().waitFor());
    // The two other screens reached without an account: an invitation link and first-run setup.
    await go(page, '/invite/0123456789abcdef0123456789abcdef');
    await check(page, 'accept an invitation', (p) => heading(p, 'Choose your password'));
    await go(page, '/setup');
    await check(page, 'first-run setup', (p) => heading(p, 'Set up Lashline'));
    await page.close();
  });

  describe('desk', () => {
    it('check-in: a bike chosen, a defect reported with a photo, and the verdict', async () => {
      const page = await as('cal@saltmarsh.test');
      await check(page, 'check-in', (p) => heading(p, 'Check-in'));
      const bikes = (await fetchJson(page, '/api/bikes')).items as { fleetNumber: string; status: string; latestOdometer: number }[];
      const bike = bikes.find((b) => b.status === 'in_service')!;
      await page.getByLabel('Fleet number or registration').fill(bike.fleetNumber);
      await page.getByRole('list', { name: 'Matching bikes' }).getByRole('button').first().click();
      await check(page, 'check-in bike chosen', (p) => p.getByLabel('Odometer now').waitFor());
      await page.getByRole('button', { name: 'Save check-in' }).click();
      await check(page, 'check-in without a reading', (p) => p.getByLabel('Odometer now').and(p.locator('[aria-invalid="true"]')).waitFor());
      await page.getByLabel('Odometer now').fill(String(Math.ceil(bike.latestOdometer + 40)));
      await page.getByRole('button', { name: 'Report a defect' }).click();
      await page.getByLabel('What does it concern?').selectOption('other');
      await page.getByLabel('What is wrong?').fill('Left mirror loose on its stem');
      await page.getByRole('button', { name: 'Save check-in' }).click();
      await page.getByText(/May go out|Do not hand this bike to a rider/).first().waitFor();
      const photo = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#3a3a3a' } }).jpeg().toBuffer();
      await page.getByRole('region', { name: 'Photo of the defect' }).locator('input[type=file]').first().setInputFiles({ name: 'mirror.jpg', mimeType: 'image/jpeg', buffer: photo });
      await check(page, 'check-in saved', (p) => p.getByRole('region', { name: 'Photo of the defect' }).getByText('Added ✓').waitFor());
      await page.close();
    });

    it('fleet register and a bike page', async () => {
      const page = await as('cal@saltmarsh.test');
      await go(page, '/fleet');
      await check(page, 'fleet register (desk)', (p) => p.getByRole('table', { name: 'Fleet register' }).getByRole('link', { name: 'SM-01' }).waitFor());
      await page.getByRole('table', { name: 'Fleet register' }).getByRole('link', { name: 'SM-07' }).click();
      await check(page, 'bike page (desk)', (p) => heading(p, 'SM-07'));
      await page.close();
    });
  });

  describe('technician', () => {
    it('my tasks, with a sign-off form open', async () => {
      const page = await as('tomasz@saltmarsh.test');
      await check(page, 'my tasks', (p) => heading(p, 'My tasks'));
      await page.getByRole('button', { name: 'Start: bike into the workshop' }).first().click();
      await check(page, 'my tasks, one started', (p) => p.getByText(/is in the workshop/).first().waitFor());
      const signOff = page.getByRole('button', { name: 'Sign off', exact: true }).first();
      await signOff.click();
      await check(page, 'task sign-off form', (p) => p.getByRole('button', { name: 'Not yet' }).first().waitFor());
      await page.close();
    });

    it('a valve card', async () => {
      const page = await as('tomasz@saltmarsh.test');
      const tasks = (await fetchJson(page, '/api/tasks?status=active')).items as { id: string; fleetNumber: string; category: string }[];
      const valves = tasks.find((t) => t.fleetNumber === 'SM-01' && t.category === 'valves')!;
      await go(page, `/tasks/${valves.id}/valves`);
      await check(page, 'valve card', (p) => p.getByRole('heading', { name: 'Cylinder 1 intake 1' }).waitFor());
      // Started from the task list or not, the card can be worked.
      const start = page.getByRole('button', { name: /Start: bike into the workshop/ });
      if (await start.count()) await start.click();
      // A reading tighter than the 0.20–0.30 mm exhaust spec brings up the shim advice.
      const valve = page.getByRole('region', { name: 'Cylinder 2 exhaust 1', exact: true });
      await valve.getByText('Measured value', { exact: true }).click();
      await valve.getByLabel('As found, measured').fill('0.18');
      await valve.getByLabel('Shim marking read off').fill('260');
      await check(page, 'valve card with a reading out of spec', (p) => p.getByRole('region', { name: 'Cylinder 2 exhaust 1', exact: true }).getByText(/2\.55/).first().waitFor());
      await page.close();
    });

    it('shim stock', async () => {
      const page = await as('tomasz@saltmarsh.test');
      await go(page, '/stock');
      await check(page, 'shim stock', (p) => heading(p, /stock/i));
      await page.close();
    });
  });

  it('on a phone at the counter and a tablet on the bench', async () => {
    const desk = await as('cal@saltmarsh.test');
    await desk.setViewportSize({ width: 390, height: 844 });
    await check(desk, 'check-in on a phone', (p) => heading(p, 'Check-in'));
    await desk.close();
    const bench = await as('tomasz@saltmarsh.test');
    await bench.setViewportSize({ width: 820, height: 1180 });
    await check(bench, 'my tasks on a tablet', (p) => heading(p, 'My tasks'));
    await bench.close();
  });

  describe('manager', () => {
    it('this week', async () => {
      const page = await as('imogen@saltmarsh.test');
      await check(page, 'this week', async (p) => {
        await heading(p, 'This week');
        await p.getByRole('heading', { name: /^Valves closing up/ }).waitFor();
      });
      await page.close();
    });

    it('tasks, fleet register, a bike page and its service record', async () => {
      const page = await as('imogen@saltmarsh.test');
      await go(page, '/tasks');
      await check(page, 'tasks (manager)', (p) => heading(p, 'Tasks'));
      await go(page, '/fleet');
      await check(page, 'fleet register (manager)', (p) => p.getByRole('table', { name: 'Fleet register' }).getByRole('link', { name: 'SM-01' }).waitFor());
      await page.getByRole('table', { name: 'Fleet register' }).getByRole('link', { name: 'SM-01' }).click();
      await check(page, 'bike page (manager)', async (p) => {
        await heading(p, 'SM-01');
        await p.getByRole('heading', { name: 'Odometer history' }).waitFor();
      });
      const bikeId = new URL(page.url()).pathname.split('/')[2];
      await go(page, `/fleet/${bikeId}/record`);
      await check(page, 'service record', (p) => p.locator('h1').first().waitFor());
      await go(page, '/fleet/new');
      await check(page, 'new bike', (p) => p.locator('h1').first().waitFor());
      await page.close();
    });

    it('valve trends, shim stock and check-in', async () => {
      const page = await as('imogen@saltmarsh.test');
      await go(page, '/valves');
      await check(page, 'valve trends', (p) => p.locator('h1').first().waitFor());
      await go(page, '/stock');
      await check(page, 'shim stock (manager)', (p) => heading(p, /stock/i));
      await go(page, '/check-in');
      await check(page, 'check-in (manager)', (p) => heading(p, 'Check-in'));
      await page.close();
    });

    it('parts and stock, as the manager and as a technician', async () => {
      const page = await as('imogen@saltmarsh.test');
      await go(page, '/parts');
      await check(page, 'parts and stock (manager)', (p) => p.getByRole('heading', { name: 'Orders', level: 2 }).waitFor());
      // A part's chart open: the lazily loaded chart and its words are checked too.
      await page.getByRole('table', { name: /Forecast need per week/ }).locator('button[aria-pressed]').first().click();
      await check(page, 'parts forecast chart', (p) => p.locator('section[aria-labelledby="forecast-part"] svg.recharts-surface').first().waitFor());
      await page.close();
      const tech = await as('tomasz@saltmarsh.test');
      await go(tech, '/parts');
      await check(tech, 'parts and stock (technician)', (p) => p.getByRole('heading', { name: 'Orders', level: 2 }).waitFor());
      await tech.close();
    });

    it('the plan board, bookings and the workshop', async () => {
      const page = await as('imogen@saltmarsh.test');
      await go(page, '/plan');
      await check(page, 'plan board', (p) => p.getByTestId('plan-board').waitFor());
      await go(page, '/plan?by=technician');
      await check(page, 'plan board by technician', (p) => p.getByTestId('plan-board').waitFor());
      await go(page, '/bookings');
      await check(page, 'bookings', (p) => p.locator('h1').first().waitFor());
      await go(page, '/workshop');
      await check(page, 'workshop', (p) => p.locator('h1').first().waitFor());
      await page.close();
    });

    it('models and plans, and the model editor', async () => {
      const page = await as('imogen@saltmarsh.test');
      await go(page, '/plans');
      await check(page, 'models and plans', (p) => p.locator('h1').first().waitFor());
      const models = (await fetchJson(page, '/api/models')).items as { id: string }[];
      await go(page, `/plans/${models[0].id}`);
      await check(page, 'model editor', (p) => p.locator('h1').first().waitFor());
      await go(page, '/plans/new');
      await check(page, 'new model', (p) => p.locator('h1').first().waitFor());
      await page.close();
    });

    it('import', async () => {
      const page = await as('imogen@saltmarsh.test');
      await go(page, '/import');
      await check(page, 'import', (p) => heading(p, 'Import from a file'));
      const bikes = (await fetchJson(page, '/api/bikes')).items as { fleetNumber: string; latestOdometer: number }[];
      const today = new Date().toISOString().slice(0, 10);
      const csv = `fleet_number,date,odometer\n${bikes[0].fleetNumber},${today},${Math.ceil(bikes[0].latestOdometer + 12)}\nSM-99,${today},100\n`;
      await page.getByLabel('CSV file').setInputFiles({ name: 'readings.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
      await page.getByRole('heading', { name: /ready, 1 with problems/ }).waitFor();
      await page.getByLabel('Only rows with problems').uncheck();
      await check(page, 'import preview', (p) => p.getByRole('table').getByText('Ready').first().waitFor());
      await page.getByRole('button', { name: /^Import 1 valid row/ }).click();
      await check(page, 'import report', (p) => p.getByRole('button', { name: 'Import another file' }).waitFor());
      await page.close();
    });
  });

  describe('admin', () => {
    it('people and sites', async () => {
      const page = await as('ada@saltmarsh.test');
      await check(page, 'people', (p) => heading(p, 'People'));
      await page.getByRole('button', { name: 'Create invitation' }).click();
      await check(page, 'people, invitation refused', (p) => p.getByRole('form', { name: 'Invite a person' }).locator('[aria-invalid="true"]').first().waitFor());
      await go(page, '/admin/sites');
      await check(page, 'sites', (p) => heading(p, 'Sites'));
      await page.getByRole('form', { name: 'Add a site' }).getByLabel('Name').fill('');
      await page.getByRole('button', { name: 'Add site' }).click();
      await check(page, 'sites, new site refused', (p) => p.getByRole('form', { name: 'Add a site' }).locator('[aria-invalid="true"]').first().waitFor());
      await page.close();
    });

    it('mail and jobs, with a message open', async () => {
      const page = await as('ada@saltmarsh.test');
      await go(page, '/admin/mail');
      await check(page, 'mail and jobs', (p) => heading(p, 'Mail and jobs'));
      await shotOnFailure(page, 'a11y-mail-send', async () => {
        // The weekly due list, sent now, lands in the built-in catcher.
        const job = page.getByRole('listitem').filter({ has: page.getByRole('heading', { name: 'Send the weekly due list' }) });
        await job.getByRole('button', { name: 'Run now' }).click();
        await job.getByRole('status').waitFor();
        await page.getByRole('button', { name: 'Check for new mail' }).click();
        await page.getByRole('list', { name: 'Caught mail' }).getByRole('link').first().click();
      });
      await check(page, 'mail message', (p) => p.getByRole('article', { name: 'Message' }).getByRole('heading').waitFor());
      // The weekly e-mail as the manager's mail reader shows it.
      const id = new URL(page.url()).pathname.split('/').pop();
      const { message } = await fetchJson(page, `/api/admin/mail/${id}`);
      const mail = await browser.newPage();
      await mail.setContent(message.html);
      await check(mail, 'weekly e-mail', (p) => p.getByRole('heading', { name: /due list/ }).first().waitFor());
      await mail.close();
      await page.close();
    });

    it('settings and backup', async () => {
      const page = await as('ada@saltmarsh.test');
      await go(page, '/admin/settings');
      await check(page, 'settings', (p) => p.locator('h1').first().waitFor());
      await go(page, '/admin/backup');
      await check(page, 'backup', (p) => p.locator('h1').first().waitFor());
      await page.close();
    });

    it('this week, fleet and plans as the administrator sees them', async () => {
      const page = await as('ada@saltmarsh.test');
      await go(page, '/this-week');
      await check(page, 'this week (admin)', (p) => heading(p, 'This week'));
      await go(page, '/fleet');
      await check(page, 'fleet register (admin)', (p) => p.getByRole('table', { name: 'Fleet register' }).getByRole('link', { name: 'SM-01' }).waitFor());
      await page.close();
    });
  });
});
