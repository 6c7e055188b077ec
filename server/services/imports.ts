import { desc, eq, inArray, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../db/client';
import { bikeModels, bikes, odometerReadings, sites } from '../db/schema';
import {
  BIKE_REQUIRED, READING_COLUMNS, checkBikeRows, checkReadingRows, missingColumns, readCsv,
  type CheckedRow, type ReadingBike,
} from '../../shared/domain/csv-rows';
import { canSeeSite } from '../../shared/domain/policies';
import { todayInZone } from '../../shared/domain/dates';
import type { ImportKind, ImportReport } from '../../shared/schemas/imports';
import type { SessionUser } from '../../shared/schemas/auth';
import { audit } from '../audit';
import { badRequest } from '../http-error';
import { applyDue, computeAll } from './due';
import { loadDueInputs } from './due-data';
import { continuousKm, currentOdometers } from './odometer-anchor';

// Multi-row inserts keep a large file to a few statements; 1,000 rows × 10 columns stays far below
// PostgreSQL's 65,535 parameters per statement.
const BATCH = 1000;
const key = (s: string) => s.trim().toLowerCase();

function linesOf(csv: string, kind: ImportKind) {
  const { fields, lines } = readCsv(csv);
  const missing = missingColumns(fields, kind === 'bikes' ? BIKE_REQUIRED : READING_COLUMNS);
  if (missing.length)
    throw badRequest(`The file lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}. The first line must name the columns.`, missing.map((m) => ({ path: `csv.${m}`, message: 'Missing column.' })));
  if (!lines.length) throw badRequest('The file has a header but no rows.', [{ path: 'csv', message: 'No rows.' }]);
  return lines;
}

async function checkBikes(db: DbOrTx, user: SessionUser, csv: string, now: Date) {
  const lines = linesOf(csv, 'bikes');
  // One after the other: inside a transaction there is one connection, which runs one query at a time.
  const models = await db.select({ id: bikeModels.id, name: bikeModels.name }).from(bikeModels);
  const siteRows = await db.select({ id: sites.id, name: sites.name, timeZone: sites.timeZone }).from(sites);
  const fleet = await db.select({ n: sql<string>`lower(${bikes.fleetNumber})` }).from(bikes);
  return checkBikeRows(lines, {
    models: new Map(models.map((m) => [key(m.name), m.id])),
    sites: new Map(siteRows.map((s) => [key(s.name), { id: s.id, mine: canSeeSite(user, s.id), today: todayInZone(s.timeZone, now) }])),
    fleetNumbers: new Set(fleet.map((f) => f.n)),
  });
}

/** The bikes the file names, with their last reading; locked when the check leads to a write. */
async function readingBikes(db: DbOrTx, user: SessionUser, fleetKeys: string[], now: Date, lock: boolean) {
  const byFleet = new Map<string, ReadingBike>();
  if (!fleetKeys.length) return { byFleet, rows: [] };
  const q = db
    .select({ bike: bikes, timeZone: sites.timeZone })
    .from(bikes)
    .innerJoin(sites, eq(sites.id, bikes.siteId))
    .where(inArray(sql`lower(${bikes.fleetNumber})`, fleetKeys));
  const rows = lock ? await q.for('update', { of: bikes }) : await q;
  const ids = rows.map((r) => r.bike.id);
  const last = ids.length
    ? await db
        .selectDistinctOn([odometerReadings.bikeId], { r: odometerReadings })
        .from(odometerReadings)
        .where(inArray(odometerReadings.bikeId, ids))
        .orderBy(odometerReadings.bikeId, desc(odometerReadings.date), desc(odometerReadings.odometerKm), desc(odometerReadings.createdAt))
    : [];
  const lastOf = new Map(last.map(({ r }) => [r.bikeId, { date: r.date, value: r.value, unit: r.unit, reset: r.reset }]));
  for (const { bike, timeZone } of rows) {
    byFleet.set(key(bike.fleetNumber), {
      id: bike.id,
      mine: canSeeSite(user, bike.siteId),
      retired: bike.status === 'retired',
      unit: bike.odometerUnit,
      today: todayInZone(timeZone, now),
      last: lastOf.get(bike.id) ?? null,
    });
  }
  return { byFleet, rows: rows.map((r) => r.bike) };
}

async function checkReadings(db: DbOrTx, user: SessionUser, csv: string, now: Date, lock = false) {
  const lines = linesOf(csv, 'readings');
  const fleetKeys = [...new Set(lines.map((l) => key(l.data.fleet_number ?? '')).filter(Boolean))];
  const { byFleet, rows } = await readingBikes(db, user, fleetKeys, now, lock);
  return { checked: checkReadingRows(lines, byFleet), bikes: rows };
}

export async function previewImport(db: Db, user: SessionUser, kind: ImportKind, csv: string, now: Date) {
  const checked: CheckedRow<unknown>[] = kind === 'bikes' ? await checkBikes(db, user, csv, now) : (await checkReadings(db, user, csv, now)).checked;
  const rows = checked.map(({ line, ok, errors, data }) => ({ line, ok, errors, data }));
  const valid = rows.filter((r) => r.ok).length;
  return { rows, valid, invalid: rows.length - valid };
}

const skippedOf = (rows: CheckedRow<unknown>[]) => rows.filter((r) => !r.ok).map(({ line, errors }) => ({ line, errors }));

async function insertBatched<T>(rows: T[], insert: (batch: T[]) => Promise<unknown>) {
  for (let i = 0; i < rows.length; i += BATCH) await insert(rows.slice(i, i + BATCH));
}

/** Due items of the touched bikes, computed in one pass. */
async function recomputeDues(tx: DbOrTx, bikeIds: string[], now: Date) {
  if (bikeIds.length) await applyDue(tx, computeAll(await loadDueInputs(tx, now, bikeIds)), now);
}

/** Imports the valid rows in one transaction: all of them or, on any failure, none. */
export async function runImport(db: Db, user: SessionUser, kind: ImportKind, csv: string, now: Date): Promise<ImportReport> {
  return db.transaction(async (tx) => {
    if (kind === 'bikes') {
      const checked = await checkBikes(tx, user, csv, now);
      const values = checked.flatMap((r) => (r.value ? [{ ...r.value, createdAt: now, updatedAt: now }] : []));
      const ids: string[] = [];
      await insertBatched(values, async (batch) => ids.push(...(await tx.insert(bikes).values(batch).returning({ id: bikes.id })).map((r) => r.id)));
      if (ids.length) await audit(tx, { userId: user.id, action: 'import', entity: 'bike', changes: { kind, rows: ids.length, bikeIds: ids } });
      await recomputeDues(tx, ids, now);
      return { imported: ids.length, skipped: skippedOf(checked), bikes: ids.length };
    }
    const { checked, bikes: touched } = await checkReadings(tx, user, csv, now, true);
    const ok = checked.flatMap((r) => (r.value ? [r.value] : []));
    const odometers = await currentOdometers(tx, touched.filter((b) => ok.some((r) => r.bikeId === b.id)));
    const values = ok.map((r) => ({
      bikeId: r.bikeId, date: r.date, value: r.value, unit: r.unit, odometerKm: continuousKm(r.value, r.unit, odometers.get(r.bikeId)!),
      reset: false, source: 'import' as const, recordedBy: user.id, createdAt: now,
    }));
    await insertBatched(values, (batch) => tx.insert(odometerReadings).values(batch));
    const perBike = new Map<string, number>();
    for (const r of ok) perBike.set(r.bikeId, (perBike.get(r.bikeId) ?? 0) + 1);
    if (ok.length) await audit(tx, { userId: user.id, action: 'import', entity: 'odometer_reading', changes: { kind, rows: ok.length, perBike: Object.fromEntries(perBike) } });
    await recomputeDues(tx, [...perBike.keys()], now);
    return { imported: ok.length, skipped: skippedOf(checked), bikes: perBike.size };
  });
}
