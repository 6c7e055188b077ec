import { asc, eq, sql } from 'drizzle-orm';
import type { Database } from '../server/db/client';
import { partStock, parts, serviceItemParts, serviceItems, sites, suppliers, users } from '../server/db/schema';
import { forecastFor, stockView } from '../server/services/parts';
import type { PartFamily, PartUnit } from '../shared/domain/parts';
import { createRng } from '../shared/domain/prng';
import type { SessionUser } from '../shared/schemas/auth';
import { MANAGER_EMAIL } from './args';
import { cpuMs } from './scan-bench';

type Category = (typeof serviceItems.$inferSelect)['category'];

// The bench shelf: 40 invented parts from three invented suppliers, two to eight of each kind, in
// the families the service items draw on.
const KINDS: { family: PartFamily; code: string; name: string; unit: PartUnit; count: number; pack: number; supplier: number }[] = [
  { family: 'oil', code: 'OIL', name: 'Engine oil, grade', unit: 'litre', count: 4, pack: 4, supplier: 0 },
  { family: 'filter', code: 'FLT', name: 'Oil filter, size', unit: 'each', count: 5, pack: 10, supplier: 1 },
  { family: 'gasket', code: 'GSK', name: 'Gasket set, type', unit: 'set', count: 5, pack: 2, supplier: 1 },
  { family: 'plug', code: 'PLG', name: 'Spark plug, heat range', unit: 'each', count: 3, pack: 4, supplier: 1 },
  { family: 'chain', code: 'CHN', name: 'Chain and sprockets, pitch', unit: 'set', count: 4, pack: 1, supplier: 1 },
  { family: 'brakes', code: 'PAD', name: 'Brake pads, pattern', unit: 'set', count: 6, pack: 2, supplier: 1 },
  { family: 'tyres', code: 'TYR', name: 'Tyre, size', unit: 'each', count: 8, pack: 1, supplier: 2 },
  { family: 'fluid', code: 'FLD', name: 'Brake fluid, grade', unit: 'litre', count: 3, pack: 0.5, supplier: 0 },
  { family: 'other', code: 'MSC', name: 'Bulb, type', unit: 'each', count: 2, pack: 10, supplier: 1 },
];
const SUPPLIERS = ['Brinemoor Lubricants', 'Harrowgate Cycle Spares', 'Kestrel Yard Tyres'];
/** The families a service of each category draws one part from. */
const USES: Record<Category, PartFamily[]> = {
  oil: ['oil', 'filter', 'gasket'],
  valves: ['gasket', 'plug'],
  chain: ['chain', 'other'],
  brakes: ['brakes', 'tyres', 'tyres'],
  tyres: ['tyres', 'tyres'],
  'brake-fluid': ['fluid', 'gasket'],
  inspection: ['plug', 'other', 'tyres'],
  other: ['other'],
};
/** Oil changes and fluid renewals take their parts every time. */
const EVERY_TIME: Category[] = ['oil', 'brake-fluid'];

export interface PartsSeeded {
  parts: number;
  suppliers: number;
  links: number;
  stockRows: number;
  /** False when the catalogue was there already (a re-run on the same data). */
  inserted: boolean;
}

const count = async (database: Database, table: typeof parts | typeof suppliers | typeof serviceItemParts | typeof partStock) =>
  (await database.db.select({ n: sql<number>`count(*)::int` }).from(table))[0].n;

/** The catalogue, every service item's parts and a shelf at every site; nothing is added when parts exist. */
export async function seedPartsCatalogue(database: Database, seed = 'lashline-parts-bench'): Promise<PartsSeeded> {
  const inserted = (await count(database, parts)) === 0;
  if (inserted) {
    const rng = createRng(seed);
    await database.db.transaction(async (tx) => {
      const supplierIds = (await tx.insert(suppliers).values(SUPPLIERS.map((name, i) => ({ name, email: `orders${i + 1}@bench-supplier.test` }))).returning({ id: suppliers.id })).map((s) => s.id);
      const rows = KINDS.flatMap((k) =>
        Array.from({ length: k.count }, (_, i) => ({
          partNumber: `BX-${k.code}-${String(i + 1).padStart(2, '0')}`, name: `${k.name} ${i + 1}`, family: k.family, unit: k.unit, packSize: k.pack,
          supplierId: supplierIds[k.supplier], leadTimeDays: rng.int(3, 14), unitCostPence: rng.int(200, 9000),
        })),
      );
      const catalogue = await tx.insert(parts).values(rows).returning({ id: parts.id, family: parts.family, unit: parts.unit });
      const items = await tx.select({ id: serviceItems.id, category: serviceItems.category }).from(serviceItems).orderBy(asc(serviceItems.id));
      const links = items.flatMap((item) => {
        const picked = new Map<string, (typeof catalogue)[number]>();
        for (const f of USES[item.category]) {
          const p = rng.pick(catalogue.filter((c) => c.family === f && !picked.has(c.id)));
          if (p) picked.set(p.id, p);
        }
        return [...picked.values()].map((p) => ({
          serviceItemId: item.id, partId: p.id,
          quantity: p.unit === 'litre' ? Math.round(rng.range(0.5, 2.5) * 10) / 10 : p.unit === 'each' ? rng.int(1, 2) : 1,
          share: EVERY_TIME.includes(item.category) ? 1 : Math.round(rng.range(0.1, 1) * 100) / 100,
        }));
      });
      await tx.insert(serviceItemParts).values(links);
      const siteIds = (await tx.select({ id: sites.id }).from(sites).orderBy(asc(sites.name))).map((s) => s.id);
      await tx.insert(partStock).values(
        siteIds.flatMap((siteId) => catalogue.map((p) => ({ siteId, partId: p.id, onHand: p.unit === 'litre' ? rng.int(5, 60) : rng.int(0, 30), minimum: rng.int(1, 6) }))),
      );
    });
  }
  return { parts: await count(database, parts), suppliers: await count(database, suppliers), links: await count(database, serviceItemParts), stockRows: await count(database, partStock), inserted };
}

/** The manager as the session holds them, with every site, as the routes pass it to the services. */
async function managerOf(database: Database): Promise<SessionUser> {
  const [u] = await database.db.select({ id: users.id, email: users.email, name: users.name }).from(users).where(eq(users.email, MANAGER_EMAIL));
  const siteIds = (await database.db.select({ id: sites.id }).from(sites).orderBy(asc(sites.name))).map((s) => s.id);
  return { ...u, role: 'manager', siteIds };
}

/** The sites by name, with the bikes in service at each: what a site's forecast simulates. */
export async function partSites(database: Database) {
  const r = await database.db.execute(sql`select s.id, s.name, count(b.id)::int as bikes from sites s left join bikes b on b.site_id = s.id and b.status <> 'retired' group by s.id, s.name order by s.name`);
  return (r as unknown as { rows: { id: string; name: string; bikes: number }[] }).rows;
}

export interface ForecastRun {
  ms: number;
  cpuMs: number;
  /** On the worker's own clock, to place its statements in the run. */
  startAt: number;
  endAt: number;
  parts: number;
  /** Parts whose cautious need runs past what is there within the horizon. */
  runningOut: number;
  runs: number;
}

/** One `forecastFor` call for a site, as GET /api/forecast makes it. */
export async function timedForecast(database: Database, siteId: string, weeks = 8): Promise<ForecastRun> {
  const user = await managerOf(database);
  const c0 = process.cpuUsage();
  const startAt = performance.now();
  const f = await forecastFor(database.db, user, siteId, weeks, new Date());
  const endAt = performance.now();
  return { ms: endAt - startAt, cpuMs: cpuMs(c0), startAt, endAt, parts: f.parts.length, runningOut: f.parts.filter((p) => p.runsOutWeek).length, runs: f.runs };
}

/** One `stockView` call, as GET /api/stock makes it: the floor of the stock page's API. */
export async function timedStock(database: Database, siteId: string) {
  const user = await managerOf(database);
  const t0 = performance.now();
  const v = await stockView(database.db, user, siteId);
  return { ms: performance.now() - t0, items: v.items.length };
}
