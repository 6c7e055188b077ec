import { rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import { openDatabase, type Database } from '../server/db/client';
import { buildScenario } from '../server/demo/scenario';
import { demoReadingTemplates } from '../server/demo/reading-templates';
import { hashPassword } from '../server/auth/passwords';
import { benchArgs, dataDirFor, DEMO_PASSWORD } from './args';
import { pgliteTarget, postgresTarget, type BulkTarget } from './bulk-load';
import { dayOf, simulateBike, type Batches, type FleetContext } from './fleet-model';
import { withFastLoad } from './fast-load';
import { cellsOf, LOAD_ORDER, TABLES, type TableKey } from './tables';

export interface GenerateOptions {
  bikes: number;
  seed: string;
  today: string;
  /** On-disk PGlite directory (recreated); ignored when databaseUrl is set. */
  dataDir?: string;
  databaseUrl?: string;
  /** Empty a PostgreSQL database that already holds data. */
  reset?: boolean;
}

export interface GenerateReport {
  bikes: number;
  rows: Partial<Record<TableKey, number>>;
  totalRows: number;
  seconds: { simulate: number; load: number; analyze: number; total: number };
}

const FLUSH_AT = 150_000;
const BULK_TABLES = ['bikes', 'odometer_readings', 'service_records', 'valve_checks', 'valve_readings'];
const MODEL_WEIGHTS: Record<string, number> = { 'Strider 125': 0.3, 'Pathfinder 250': 0.25, 'Ridgeback 400': 0.2, 'Breeze 125': 0.25 };
const emptyBatches = () => Object.fromEntries(LOAD_ORDER.map((k) => [k, []])) as unknown as Batches;

async function openFresh(o: GenerateOptions): Promise<Database> {
  if (!o.databaseUrl) {
    rmSync(o.dataDir!, { recursive: true, force: true });
    return openDatabase({ dataDir: o.dataDir });
  }
  const d = await openDatabase({ databaseUrl: o.databaseUrl });
  const { rows } = (await d.db.execute(sql`select count(*)::int as n from bikes`)) as unknown as { rows: { n: number }[] };
  const tables = (await d.db.execute(sql`select tablename from pg_tables where schemaname = 'public'`)) as unknown as { rows: { tablename: string }[] };
  if (rows[0].n > 0 && !o.reset) {
    await d.close();
    throw new Error('The PostgreSQL database in DATABASE_URL already holds bikes. Pass --reset to empty it for the benchmark.');
  }
  await d.db.execute(sql.raw(`truncate ${tables.rows.map((t) => `"${t.tablename}"`).join(', ')} cascade`));
  return d;
}

/** Builds the synthetic fleet straight into a fresh database, in one transaction. */
export async function generateFleet(o: GenerateOptions): Promise<GenerateReport> {
  const t0 = performance.now();
  const database = await openFresh(o);
  const target: BulkTarget = database.pglite ? pgliteTarget(database.pglite) : await postgresTarget(o.databaseUrl!);
  const base = buildScenario(o.today);
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const staff = (role: string, siteId: string) => base.users.find((u) => u.role === role && base.userSites.some((s) => s.userId === u.id && s.siteId === siteId))!.id;
  const ctx: FleetContext = {
    seed: o.seed,
    today: dayOf(o.today),
    models: base.models.map((row) => ({ row, items: base.serviceItems.filter((i) => i.modelId === row.id), weight: MODEL_WEIGHTS[row.name] ?? 0.25 })),
    sites: base.sites.map((s, i) => ({ id: s.id, use: i === 0 ? 'rental' : 'training', share: i === 0 ? 0.6 : 0.4, tech: staff('technician', s.id), desk: staff('desk', s.id) })),
  };
  const rows: Partial<Record<TableKey, number>> = {};
  let simulate = 0;
  let load = 0;
  const flush = async (b: Batches) => {
    const l0 = performance.now();
    for (const k of LOAD_ORDER) {
      if (!b[k].length) continue;
      await target.load(TABLES[k], b[k]);
      rows[k] = (rows[k] ?? 0) + b[k].length;
    }
    load += performance.now() - l0;
  };

  await target.exec('BEGIN');
  try {
    const ref = emptyBatches();
    const objs: [TableKey, object[]][] = [
      ['sites', base.sites], ['users', base.users.map((u) => ({ ...u, passwordHash }))], ['userSites', base.userSites],
      ['bikeModels', base.models], ['serviceItems', base.serviceItems], ['readingTemplates', demoReadingTemplates(base.serviceItems).map((t) => ({ ...t, safetyCritical: t.safetyCritical ?? false }))],
      ['shimStock', base.shimStock],
    ];
    for (const [k, list] of objs) ref[k] = list.map((r) => cellsOf(TABLES[k], r));
    await flush(ref);
    await withFastLoad(target, BULK_TABLES, async () => {
      let batch = emptyBatches();
      for (let i = 0; i < o.bikes; i++) {
        const s0 = performance.now();
        simulateBike(ctx, i, o.bikes, batch);
        simulate += performance.now() - s0;
        if (batch.odometerReadings.length >= FLUSH_AT) {
          await flush(batch);
          batch = emptyBatches();
        }
      }
      await flush(batch);
    });
    await target.exec('COMMIT');
  } catch (e) {
    await target.exec('ROLLBACK').catch(() => {});
    throw e;
  }
  // Planner statistics, as autovacuum would gather them on a server; PGlite has no autovacuum.
  const a0 = performance.now();
  await target.exec('ANALYZE');
  const analyze = performance.now() - a0;
  await target.close();
  await database.close();
  const report: GenerateReport = {
    bikes: o.bikes,
    rows,
    totalRows: Object.values(rows).reduce((s, n) => s + (n ?? 0), 0),
    seconds: { simulate: simulate / 1000, load: load / 1000, analyze: analyze / 1000, total: (performance.now() - t0) / 1000 },
  };
  if (o.dataDir && !o.databaseUrl) writeFileSync(join(o.dataDir, 'fleet.json'), JSON.stringify({ ...o, report }, null, 2));
  return report;
}

export function describeGeneration(r: GenerateReport) {
  const n = (x: number) => x.toLocaleString('en-GB');
  const parts = Object.entries(r.rows).map(([k, v]) => `${TABLES[k as TableKey].name} ${n(v ?? 0)}`);
  const s = r.seconds;
  return `${n(r.bikes)} bikes: ${n(r.totalRows)} rows (${parts.join(', ')}) in ${s.total.toFixed(1)} s ` +
    `(simulate ${s.simulate.toFixed(1)} s, load ${s.load.toFixed(1)} s, analyze ${s.analyze.toFixed(1)} s; ${n(Math.round(r.totalRows / s.total))} rows/s)`;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const a = benchArgs();
  generateFleet({ bikes: a.bikes, seed: a.seed, today: a.today, dataDir: dataDirFor(a.bikes), databaseUrl: a.databaseUrl, reset: a.reset })
    .then((r) => console.log(describeGeneration(r)))
    .catch((e) => {
      console.error(e instanceof Error ? e.message : e);
      process.exit(1);
    });
}
