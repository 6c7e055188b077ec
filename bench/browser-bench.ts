import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { DEMO_PASSWORD, MANAGER_EMAIL } from './args';
import { installPageMetrics, pageScript, timeSortClick, type PageMetrics } from './page-metrics';

export const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const ARGS = ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage'];

export interface ScreenFigures {
  route: string;
  firstRowMs: number | null;
  lcpMs: number | null;
  cls: number;
  shifts: PageMetrics['shifts'];
  /** The slowest of three header clicks, until the table's DOM had changed, and until the next frame. */
  sortDomMs: number | null;
  sortPaintMs: number | null;
  sortChanged: boolean;
  rows: number;
  /** Response end of the screen's main API call, from navigation start (Resource Timing). */
  apiMs: number | null;
  apiPath: string;
  scriptBytes: number;
  /** Scripts and API calls of the navigation, from navigation start: what waited for what. */
  waterfall: { path: string; start: number; end: number; bytes: number }[];
}

interface Screen {
  route: string;
  api: string;
  /** The sortable table's caption and a header to click; none on the plan board. */
  table?: string;
  header?: string;
  /** The first rows counted are this table's, on a screen with more tables than one. */
  firstRowsOfTable?: boolean;
}
export const SCREENS: Screen[] = [
  { route: '/fleet', api: '/api/bikes', table: 'Fleet register', header: 'Odometer' },
  { route: '/this-week', api: '/api/due', table: 'Due within 7 days', header: 'Bike' },
  // First visible: the first visit block on the board (page-metrics.ts).
  { route: '/plan', api: '/api/plan' },
  // The shelf, not the forecast table below it that may answer on its own time.
  { route: '/parts', api: '/api/stock', table: 'Parts on the shelf at this site', header: 'On hand', firstRowsOfTable: true },
];
/** Route → the caption of the table whose first row counts, for installPageMetrics. */
const FIRST_TABLES = Object.fromEntries(SCREENS.filter((s) => s.firstRowsOfTable).map((s) => [s.route, s.table!]));

async function measure(page: Page, base: string, s: Screen): Promise<ScreenFigures> {
  await page.goto(`${base}${s.route}`, { waitUntil: 'commit' });
  await page.waitForFunction(() => (window as unknown as { __bench: PageMetrics }).__bench.firstRowAt !== null, null, { timeout: 90_000 });
  await page.waitForLoadState('networkidle', { timeout: 30_000 }).catch(() => {});
  await page.waitForTimeout(500);
  const m = await page.evaluate(pageScript(({ api, caption }: { api: string; caption: string | null }) => {
    const entries = performance.getEntriesByType('resource') as PerformanceResourceTiming[];
    const call = entries.find((e) => new URL(e.name).pathname === api);
    return {
      metrics: (window as unknown as { __bench: PageMetrics }).__bench,
      apiMs: call ? call.responseEnd : null,
      scriptBytes: entries.filter((e) => e.initiatorType === 'script' || e.name.endsWith('.js')).reduce((t, e) => t + e.encodedBodySize, 0),
      rows: caption
        ? ([...document.querySelectorAll('table')].find((t) => t.caption?.textContent?.trim() === caption)?.querySelectorAll('tbody tr').length ?? 0)
        : document.querySelectorAll(location.pathname === '/plan' ? '[data-testid^="visit-"]' : 'tbody tr').length,
      waterfall: entries
        .filter((e) => e.name.endsWith('.js') || new URL(e.name).pathname.startsWith('/api/'))
        .map((e) => ({ path: new URL(e.name).pathname, start: e.startTime, end: e.responseEnd, bytes: e.encodedBodySize })),
    };
  }, { api: s.api, caption: s.firstRowsOfTable ? s.table! : null })) as { metrics: PageMetrics; apiMs: number | null; scriptBytes: number; rows: number; waterfall: ScreenFigures['waterfall'] };
  const sorts: { domMs: number; paintMs: number; changed: boolean }[] = [];
  for (let i = 0; i < (s.table ? 3 : 0); i++) {
    const r = (await page.evaluate(pageScript(timeSortClick, { caption: s.table!, header: s.header! }))) as (typeof sorts)[number] | null;
    if (r) sorts.push(r);
    await page.waitForTimeout(200);
  }
  const worst = (k: 'domMs' | 'paintMs') => (sorts.length ? Math.max(...sorts.map((x) => x[k])) : null);
  return {
    route: s.route,
    firstRowMs: m.metrics.firstRowAt,
    lcpMs: m.metrics.lcp,
    cls: m.metrics.cls,
    shifts: m.metrics.shifts,
    sortDomMs: worst('domMs'),
    sortPaintMs: worst('paintMs'),
    sortChanged: sorts.length > 0 && sorts.every((x) => x.changed),
    rows: m.rows,
    apiMs: m.apiMs,
    apiPath: s.api,
    scriptBytes: m.scriptBytes,
    waterfall: m.waterfall,
  };
}

/** Chromium on a fresh profile of its own, closed and removed afterwards. */
async function withBrowser<T>(viewport: { width: number; height: number }, fn: (context: BrowserContext) => Promise<T>): Promise<T> {
  const profile = await mkdtemp(join(tmpdir(), 'lashline-bench-'));
  const context = await chromium.launchPersistentContext(profile, { executablePath: CHROMIUM, headless: true, viewport, args: ARGS });
  try {
    return await fn(context);
  } finally {
    await context.close();
    await rm(profile, { recursive: true, force: true });
  }
}

/** A page signed in as the manager through the sign-in screen, on This week. */
async function signedInPage(context: BrowserContext, base: string): Promise<Page> {
  const page = context.pages()[0] ?? (await context.newPage());
  page.setDefaultTimeout(90_000);
  await page.goto(`${base}/sign-in`);
  await page.getByLabel('E-mail').fill(MANAGER_EMAIL);
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(/\/this-week$/);
  return page;
}

/** Signs in as the manager through the sign-in screen, then opens each screen afresh. */
export async function browserBench(base: string): Promise<ScreenFigures[]> {
  return withBrowser({ width: 1280, height: 900 }, async (context) => {
    await context.addInitScript({ content: pageScript(installPageMetrics, FIRST_TABLES) });
    const page = await signedInPage(context, base);
    // The board signing in lands on has finished loading (it shows its rows once every part is in),
    // so each screen below is opened on a quiet server rather than behind the board's requests.
    await page.locator('tbody tr').first().waitFor({ timeout: 90_000 });
    await page.waitForTimeout(500);
    const out: ScreenFigures[] = [];
    for (const s of SCREENS) out.push(await measure(page, base, s));
    return out;
  });
}

export interface OfflineCardFigures {
  viewport: string;
  /** Reload without a network → the card's first valve on screen, from navigation start; one per run. */
  runsMs: number[];
  valves: number;
}

/**
 * A valve card opened with the network switched off, on a tablet's viewport: the shell comes from
 * the service worker's precache and the card from the answers kept on the device.
 */
export async function offlineCardBench(base: string, runs = 5): Promise<OfflineCardFigures> {
  const viewport = { width: 1024, height: 768 };
  return withBrowser(viewport, async (context) => {
    const page = await signedInPage(context, base);
    const taskId = await page.evaluate(async () => {
      const items = (await (await fetch('/api/tasks?status=active')).json()).items as { id: string; category: string }[];
      return items.find((t) => t.category === 'valves')?.id;
    });
    if (!taskId) throw new Error('No open valve task in the bench fleet.');
    const valves = page.getByRole('region', { name: 'Valves' }).getByRole('heading');
    await page.goto(`${base}/tasks/${taskId}/valves`);
    await valves.first().waitFor();
    await page.evaluate(() => navigator.serviceWorker.ready);
    await page.reload();
    await page.waitForFunction(() => !!navigator.serviceWorker.controller);
    await valves.first().waitFor();
    // Kept answers are written to the device at most once a second.
    await page.waitForTimeout(1500);
    await context.setOffline(true);
    const runsMs: number[] = [];
    for (let i = 0; i < runs; i++) {
      await page.reload({ waitUntil: 'commit' });
      await valves.first().waitFor();
      runsMs.push(await page.evaluate(() => performance.now()));
    }
    return { viewport: `${viewport.width}×${viewport.height}`, runsMs, valves: await valves.count() };
  });
}
