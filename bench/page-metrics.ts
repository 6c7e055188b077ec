/**
 * Runs in the page before its own scripts (Playwright's addInitScript), so it must stay
 * self-contained: it records LCP, CLS and when the first table row is on screen.
 */

export interface PageMetrics {
  lcp: number | null;
  cls: number;
  firstRowDomAt: number | null;
  firstRowAt: number | null;
  /** The bigger shifts and what moved, to say where the CLS comes from. */
  shifts: { value: number; at: number; moved: string[] }[];
}

type Shift = PerformanceEntry & { value: number; hadRecentInput: boolean; sources?: { node?: Node | null }[] };

/** `firstTables`: route → caption of the table whose first row counts there (else the page's first row). */
export function installPageMetrics(firstTables: Record<string, string> | null) {
  const state: PageMetrics = { lcp: null, cls: 0, firstRowDomAt: null, firstRowAt: null, shifts: [] };
  const describe = (node: Node | null | undefined) => {
    if (!node || !(node instanceof Element)) return node?.nodeName ?? '?';
    const text = (node.textContent ?? '').trim().replace(/\s+/g, ' ').slice(0, 40);
    return `${node.tagName.toLowerCase()}${node.id ? `#${node.id}` : ''} "${text}"`;
  };
  (window as unknown as { __bench: PageMetrics }).__bench = state;
  try {
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) state.lcp = e.startTime;
    }).observe({ type: 'largest-contentful-paint', buffered: true });
    // CLS is the largest session window of shifts: under 1 s apart, at most 5 s long (web.dev, "Cumulative Layout Shift").
    let win = 0;
    let winStart = 0;
    let last = -Infinity;
    new PerformanceObserver((list) => {
      for (const e of list.getEntries() as Shift[]) {
        if (e.hadRecentInput) continue;
        if (e.startTime - last < 1000 && e.startTime - winStart < 5000) win += e.value;
        else {
          win = e.value;
          winStart = e.startTime;
        }
        last = e.startTime;
        state.cls = Math.max(state.cls, win);
        if (e.value >= 0.01) state.shifts.push({ value: e.value, at: e.startTime, moved: (e.sources ?? []).map((x) => describe(x.node)) });
      }
    }).observe({ type: 'layout-shift', buffered: true });
  } catch {
    // An engine without these entry types leaves the figures empty.
  }
  const check = () => {
    if (state.firstRowDomAt !== null) return;
    // A table's first row (of the named table where there is one); on the plan board, its first visit block.
    const caption = firstTables?.[location.pathname];
    const tr = caption
      ? [...document.querySelectorAll('table')].find((t) => t.caption?.textContent?.trim() === caption)?.querySelector('tbody tr')
      : document.querySelector(location.pathname === '/plan' ? '[data-testid^="visit-"]' : 'tbody tr');
    if (!tr || tr.getBoundingClientRect().height === 0) return;
    state.firstRowDomAt = performance.now();
    observer.disconnect();
    // The frame after the row is in the DOM is the one that paints it.
    requestAnimationFrame(() => {
      state.firstRowAt = performance.now();
    });
  };
  const observer = new MutationObserver(check);
  observer.observe(document, { childList: true, subtree: true });
}

/**
 * The source of a function to run in the page. tsx keeps function names with a `__name` helper
 * that only exists in Node, so the page gets a stand-in for it.
 */
export function pageScript<A>(fn: (arg: A) => unknown, arg?: A) {
  return `(() => { const __name = (f) => f; return (${fn.toString()})(${JSON.stringify(arg ?? null)}); })()`;
}

/** Clicks a column header of the table with this caption and times it until the table has changed. */
export function timeSortClick(args: { caption: string; header: string }): Promise<{ domMs: number; paintMs: number; changed: boolean } | null> {
  const table = [...document.querySelectorAll('table')].find((t) => t.caption?.textContent?.trim() === args.caption);
  const button = table && [...table.querySelectorAll('thead th button')].find((b) => b.textContent?.includes(args.header));
  const body = table?.querySelector('tbody');
  if (!table || !button || !body) return Promise.resolve(null);
  const before = body.firstElementChild?.textContent ?? '';
  return new Promise((resolve) => {
    const t0 = performance.now();
    const observer = new MutationObserver(() => {
      const domMs = performance.now() - t0;
      observer.disconnect();
      requestAnimationFrame(() => setTimeout(() => resolve({ domMs, paintMs: performance.now() - t0, changed: (body.firstElementChild?.textContent ?? '') !== before })));
    });
    observer.observe(body, { childList: true, subtree: true, characterData: true });
    setTimeout(() => {
      observer.disconnect();
      resolve({ domMs: Number.NaN, paintMs: Number.NaN, changed: false });
    }, 10_000);
    (button as HTMLButtonElement).click();
  });
}
