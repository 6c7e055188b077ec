import { probe, type Probe } from './evidence';
import { signIn, timedRequest } from './http-session';
import { checkInLoader, dueListLoad, type CheckInRun, type LoadFigures } from './load';
import { median, percentile } from './report';
import type { Worker } from './worker-client';
import type { CpuSummary } from './cpu-profile';
import type { ForecastRun, PartsSeeded } from './parts-bench';
import type { Statement } from './raw-sql';

interface ScanRun {
  ms: number;
  cpuMs: number;
  summary: string;
  tasksRaised: number;
}
interface FloorRun {
  ms: number;
  rows: number;
  leanMs: number;
  leanRows: number;
}

export interface ScanFigures {
  bikes: number;
  first: ScanRun;
  repeatMs: number;
  repeatCpuMs: number;
  floorMs: number;
  floorRows: number;
  leanFloorMs: number;
  leanFloorRows: number;
  parts: Record<string, number>;
  probe: Probe;
}

/** The due scan three times (the first raises the tasks; the repeats find them raised), and the floor three times. */
export async function scanPhase(w: Worker, bikes: number): Promise<ScanFigures> {
  let first: ScanRun | undefined;
  const p = await probe(w, `Due scan, ${bikes.toLocaleString('en-GB')} bikes, first run`, async () => {
    first = await w.call<ScanRun>('scan');
  });
  const repeats = [await w.call<ScanRun>('scan'), await w.call<ScanRun>('scan')];
  const parts = await w.call<Record<string, number>>('scanParts');
  const floors: FloorRun[] = [];
  for (let i = 0; i < 3; i++) floors.push(await w.call<FloorRun>('floor'));
  return {
    bikes,
    first: first!,
    repeatMs: median(repeats.map((r) => r.ms)),
    repeatCpuMs: median(repeats.map((r) => r.cpuMs)),
    floorMs: median(floors.map((f) => f.ms)),
    floorRows: floors[0].rows,
    leanFloorMs: median(floors.map((f) => f.leanMs)),
    leanFloorRows: floors[0].leanRows,
    parts,
    probe: p,
  };
}

/**
 * Waits until the server has finished every request it took, abandoned ones included, and stays
 * quiet (no SQL) for a second: PGlite runs each query on the server's main thread, so requests a
 * client gave up on can still be read from their sockets after a busy spell.
 */
export async function settle(w: Worker, maxMs = 180_000) {
  const until = Date.now() + maxMs;
  for (let quiet = 0; quiet < 2; ) {
    if (Date.now() > until) throw new Error(`The server was still busy ${maxMs / 1000} s after the load stopped.`);
    await w.call('recordStart');
    await new Promise((r) => setTimeout(r, 500));
    const statements = await w.call<unknown[]>('recordStop');
    quiet = statements.length === 0 && (await w.call<number>('inFlight')) === 0 ? quiet + 1 : 0;
  }
}

export interface ApiFigures {
  probes: Probe[];
  direct: { p50: number; p99: number; runs: number; items: number };
  /** With the server's event-loop delay during the run: how long it could not even read a socket. */
  dueLoad: LoadFigures & { loopDelayMax: number; loopDelayP99: number };
  checkIns: { warm: LoadFigures; main: CheckInRun; rowsAdded: number; found: number; floorPerSecond: number };
  seconds: Record<string, number>;
  /** The server's CPU profile during each load. */
  cpu: (CpuSummary & { label: string })[];
}

export async function apiPhase(w: Worker): Promise<ApiFigures> {
  const seconds: Record<string, number> = {};
  const cpu: ApiFigures['cpu'] = [];
  const lap = async <T>(name: string, f: () => Promise<T>) => {
    const t0 = performance.now();
    const r = await f();
    seconds[name] = (performance.now() - t0) / 1000;
    return r;
  };
  const s = await signIn(w.url);
  await timedRequest(w.url, s, '/api/due?within=7');
  const probes = [
    await probe(w, 'GET /api/due?within=7 (one request)', () => timedRequest(w.url, s, '/api/due?within=7')),
    await probe(w, 'GET /api/bikes (the fleet register data, one request)', () => timedRequest(w.url, s, '/api/bikes')),
  ];
  const direct = await lap('Due list straight on the database', () => w.call<{ times: number[]; items: number }>('listDue', { maxRuns: 40, maxMs: 8000 }));
  const dueLoad = await lap('Due list API under autocannon', async () => {
    await w.call('loopDelayStart');
    await w.call('cpuStart');
    const r = await dueListLoad(w.url, s);
    const loop = await w.call<{ max: number; p99: number }>('loopDelayStop');
    await settle(w);
    cpu.push({ label: 'GET /api/due?within=7 under 20 connections', ...(await w.call<CpuSummary>('cpuStop')) });
    return { ...r, loopDelayMax: loop.max, loopDelayP99: loop.p99 };
  });

  const checkIns = await lap('Check-ins under autocannon', async () => {
    const targets = await w.call<{ id: string; value: number }[]>('checkInTargets');
    const run = checkInLoader(w.url, s, targets);
    probes.push(await probe(w, 'POST /api/bikes/:id/check-ins (one request)', () => run({ connections: 1, amount: 1 })));
    // The warm-up counts its answers too (amount, not duration), so none is abandoned half-done.
    const warm = await run({ connections: 20, amount: 100 });
    await settle(w);
    const before = await w.call<number>('readings');
    // About ten seconds at the rate the warm-up reached, and never fewer than 1,000: autocannon counts
    // its duration in whole ticks, so a run of two or three seconds understates the rate by a third.
    const amount = Math.min(4000, Math.max(1000, Math.round(warm.perSecond * 10)));
    await w.call('cpuStart');
    const main = await run({ connections: 20, amount });
    await settle(w);
    cpu.push({ label: 'POST check-ins under 20 connections', ...(await w.call<CpuSummary>('cpuStop')) });
    const rowsAdded = (await w.call<number>('readings')) - before;
    const found = await w.call<number>('existing', { ids: main.createdIds });
    const floor = await w.call<{ perSecond: number }>('insertFloor', { maxMs: 3000 });
    return { warm, main, rowsAdded, found, floorPerSecond: floor.perSecond };
  });
  return {
    probes,
    direct: { p50: percentile(direct.times, 50), p99: percentile(direct.times, 99), runs: direct.times.length, items: direct.items },
    dueLoad,
    checkIns,
    seconds,
    cpu,
  };
}

export interface SiteParts {
  site: string;
  bikes: number;
  cold: ForecastRun;
  /** Medians of the warm runs, straight on the database. */
  warmMs: number;
  warmCpuMs: number;
  warmRuns: number;
  /** One warm run in its parts: each statement with the JS run before it (building on the one before), and the JS after the last. */
  split: ForecastSplit;
  stockDirectMs: number;
  /** Medians over HTTP with the manager's session, each request to its whole answer. */
  stockHttpMs: number;
  forecastHttpMs: number;
  httpRuns: number;
}

export interface PartsFigures {
  seeded: PartsSeeded;
  sites: SiteParts[];
  probes: Probe[];
  cpu: CpuSummary & { label: string };
}

const WARM_RUNS = 5;
const HTTP_RUNS = 7;

export interface ForecastSplit {
  wallMs: number;
  sqlMs: number;
  statements: { sql: string; ms: number; rows: number; jsBeforeMs: number }[];
  tailMs: number;
}

/** Where one forecast's wall time went, from the statements it sent, placed on the server's clock. */
function splitRun(run: ForecastRun, statements: Statement[]): ForecastSplit {
  const own = statements.filter((s) => s.at >= run.startAt && s.at <= run.endAt).sort((a, b) => a.at - b.at);
  let end = run.startAt;
  const out: ForecastSplit['statements'] = [];
  for (const s of own) {
    out.push({ sql: s.sql, ms: s.ms, rows: s.rows, jsBeforeMs: Math.max(0, s.at - end) });
    end = Math.max(end, s.at + s.ms);
  }
  return { wallMs: run.ms, sqlMs: own.reduce((t, s) => t + s.ms, 0), statements: out, tailMs: run.endAt - end };
}

/**
 * The parts forecast and the stock page on the fleet: a 40-part catalogue is added first (once),
 * then each site's forecast is timed straight on the database, cold and warm, and the stock and
 * forecast answers through the app with the manager's session.
 */
export async function partsPhase(w: Worker): Promise<PartsFigures> {
  const seeded = await w.call<PartsSeeded>('seedParts');
  const siteRows = await w.call<{ id: string; name: string; bikes: number }[]>('partSites');
  const forecast = (siteId: string) => w.call<ForecastRun>('forecast', { siteId, weeks: 8 });
  // Every site's first forecast before any repeat: the cold figures.
  const colds = [];
  for (const s of siteRows) colds.push(await forecast(s.id));
  const probes: Probe[] = [];
  const sess = await signIn(w.url);
  const out: SiteParts[] = [];
  for (const [i, s] of siteRows.entries()) {
    const warm: ForecastRun[] = [];
    for (let k = 0; k < WARM_RUNS; k++) warm.push(await forecast(s.id));
    let run: ForecastRun | undefined;
    const p = await probe(w, `Parts forecast, ${s.name} (${s.bikes.toLocaleString('en-GB')} bikes, 8 weeks, one warm run)`, async () => {
      run = await forecast(s.id);
    });
    probes.push(p);
    const stockDirect: number[] = [];
    for (let k = 0; k < HTTP_RUNS; k++) stockDirect.push((await w.call<{ ms: number }>('stock', { siteId: s.id })).ms);
    const stockHttp: number[] = [];
    for (let k = 0; k < HTTP_RUNS; k++) stockHttp.push(checked(await timedRequest(w.url, sess, `/api/stock?site=${s.id}`)).ms);
    const forecastHttp: number[] = [];
    for (let k = 0; k < WARM_RUNS; k++) forecastHttp.push(checked(await timedRequest(w.url, sess, `/api/forecast?site=${s.id}&weeks=8`)).ms);
    out.push({
      site: s.name,
      bikes: s.bikes,
      cold: colds[i],
      warmMs: median(warm.map((r) => r.ms)),
      warmCpuMs: median(warm.map((r) => r.cpuMs)),
      warmRuns: warm.length,
      split: splitRun(run!, p.statements),
      stockDirectMs: median(stockDirect),
      stockHttpMs: median(stockHttp),
      forecastHttpMs: median(forecastHttp),
      httpRuns: HTTP_RUNS,
    });
  }
  // Where the CPU goes, on runs of their own so the sampling slows none of the figures above.
  await w.call('cpuStart');
  for (const s of siteRows) for (let k = 0; k < 2; k++) await forecast(s.id);
  const cpu = { label: `Parts forecast, every site twice (${seeded.parts} parts, 8 weeks)`, ...(await w.call<CpuSummary>('cpuStop')) };
  return { seeded, sites: out, probes, cpu };
}

function checked<T extends { status: number; text: string }>(r: T): T {
  if (r.status !== 200) throw new Error(`The parts API answered ${r.status}: ${r.text.slice(0, 200)}`);
  return r;
}
