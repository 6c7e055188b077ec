import { probe, type Probe } from './evidence';
import { signIn, timedRequest } from './http-session';
import { checkInLoader, dueListLoad, type CheckInRun, type LoadFigures } from './load';
import { median, percentile } from './report';
import type { Worker } from './worker-client';
import type { CpuSummary } from './cpu-profile';

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
