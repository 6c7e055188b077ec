import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { benchArgs, BENCH_DIR, DATA_ROOT, dataDirFor, type BenchArgs } from './args';
import { describeGeneration, generateFleet, type GenerateReport } from './generate';
import { buildAndWeigh, type BundleFigures } from './bundle-size';
import { browserBench, offlineCardBench, type OfflineCardFigures, type ScreenFigures } from './browser-bench';
import { apiPhase, partsPhase, scanPhase, type ApiFigures, type PartsFigures, type ScanFigures } from './phases';
import { figureRows } from './figures';
import { figuresTable, load, machine, phasesTable, type Phase } from './report';
import { resultsMarkdown } from './results-file';
import { startWorker, type Memory, type Worker } from './worker-client';
import type { PlanFigures } from './plan-bench';

/**
 * The fleet-scale benchmark: generates the synthetic fleets, then measures the due scan, the due
 * list and check-ins through the real app, the workshop plan, the parts forecast and the stock page,
 * the client build and the screens in Chromium, and the server's memory. Prints one table and
 * writes it with the machine's details to bench/RESULTS.md.
 *
 *   npm run bench                      2,000 bikes (and 200 for the scaling exponent), on-disk PGlite
 *   npm run bench -- --full            also 20,000 bikes (about 15 million readings: long)
 *   npm run bench -- --bikes 200       another main size; --seed, --today YYYY-MM-DD, --skip-client
 *   DATABASE_URL=postgres://… npm run bench -- --reset   on a PostgreSQL server (--reset empties it)
 */

export interface Results {
  args: BenchArgs;
  generated: GenerateReport[];
  scans: ScanFigures[];
  api?: ApiFigures;
  plan?: PlanFigures;
  parts?: PartsFigures;
  bundle?: BundleFigures;
  offlineCard?: OfflineCardFigures;
  screens?: ScreenFigures[];
  memory?: { start: Memory; end: Memory; afterGc: Memory };
  phases: Phase[];
  loadBefore: string;
  loadAfter?: string;
}

async function timed<T>(phases: Phase[], phase: string, f: () => Promise<T> | T): Promise<T> {
  const t0 = performance.now();
  console.log(`… ${phase}`);
  const r = await f();
  phases.push({ phase, seconds: (performance.now() - t0) / 1000 });
  return r;
}

async function withFleet<T>(res: Results, bikes: number, reset: boolean, f: (w: Worker, restart: () => Promise<Worker>) => Promise<T>, dist?: string): Promise<T> {
  const a = res.args;
  const dataDir = dataDirFor(bikes);
  const g = await timed(res.phases, `Generate ${bikes.toLocaleString('en-GB')} bikes`, () =>
    generateFleet({ bikes, seed: a.seed, today: a.today, dataDir, databaseUrl: a.databaseUrl, reset }),
  );
  console.log(`  ${describeGeneration(g)}`);
  res.generated.push(g);
  const start = () => startWorker({ dataDir: a.databaseUrl ? undefined : dataDir, dist });
  let w = await timed(res.phases, `Start the server on ${bikes.toLocaleString('en-GB')} bikes`, start);
  const restart = async () => {
    await w.stop();
    w = await timed(res.phases, `Start the server again on ${bikes.toLocaleString('en-GB')} bikes`, start);
    return w;
  };
  try {
    return await f(w, restart);
  } finally {
    await w.stop();
  }
}

async function main() {
  const args = benchArgs();
  const res: Results = { args, generated: [], scans: [], phases: [], loadBefore: load() };
  const t0 = performance.now();
  const dist = join(DATA_ROOT, 'dist');
  if (!args.skipClient) res.bundle = await timed(res.phases, 'Client build (vite) and gzip sizes', () => buildAndWeigh(dist));

  const sizes = [...new Set([200, args.bikes])].sort((x, y) => x - y);
  for (const [i, bikes] of sizes.entries()) {
    const main = bikes === args.bikes;
    await withFleet(res, bikes, args.reset || i > 0, async (scanner, restart) => {
      res.scans.push(await timed(res.phases, `Due scan ×3 and floor ×3, ${bikes.toLocaleString('en-GB')} bikes`, () => scanPhase(scanner, bikes)));
      if (!main) return;
      // The floors read far more rows than the product ever does, and PGlite's memory never shrinks:
      // the product's own figures (API, screens, memory) come from a server started afresh on the data.
      const w = await restart();
      res.api = await apiPhase(w);
      for (const [k, v] of Object.entries(res.api.seconds)) res.phases.push({ phase: k, seconds: v });
      // The workshop plan on this fleet: bays, technicians and 3,000 bookings are added first, so
      // the screens below include the plan board with its visits.
      res.plan = await timed(res.phases, `Workshop plan, ${bikes.toLocaleString('en-GB')} bikes`, () => w.call<PlanFigures>('plan', { bikes }));
      // A 40-part catalogue linked to every service item and shelved at both sites (added once),
      // then the forecast and the stock answers; the screens below include the parts screen.
      res.parts = await timed(res.phases, `Parts forecast and stock, ${bikes.toLocaleString('en-GB')} bikes`, () => partsPhase(w));
      if (!args.skipClient) res.screens = await timed(res.phases, 'Chromium: sign in, /fleet, /this-week, /plan, /parts', () => browserBench(w.url));
      if (!args.skipClient) res.offlineCard = await timed(res.phases, 'Chromium, tablet viewport: a valve card opened offline', () => offlineCardBench(w.url));
      res.memory = { start: w.startMemory, end: await w.call<Memory>('memory'), afterGc: await w.call<Memory>('memoryAfterGc') };
    }, main ? dist : undefined);
  }
  if (args.full && args.bikes < 20_000) {
    await withFleet(res, 20_000, true, async (w) => {
      res.scans.push(await timed(res.phases, 'Due scan ×3 and floor ×3, 20,000 bikes', () => scanPhase(w, 20_000)));
    });
  }
  res.phases.push({ phase: 'Whole run', seconds: (performance.now() - t0) / 1000 });
  res.loadAfter = load();

  const rows = figureRows(res);
  console.log(`\n${figuresTable(rows)}\n\n${phasesTable(res.phases)}\n`);
  const file = join(BENCH_DIR, 'RESULTS.md');
  writeFileSync(file, resultsMarkdown(res, rows, machine()));
  console.log(`Written to ${file}.`);
}

main().catch((e) => {
  console.error(e instanceof Error ? (e.stack ?? e.message) : e);
  process.exit(1);
});
