import type { Db, DbOrTx } from '../db/client';
import { bookings } from '../db/schema';
import { missingColumns, readCsv, type CsvLine, type RowError } from '../../shared/domain/csv-rows';
import { checkRule, parseBookingTime } from '../../shared/domain/bookings';
import { BOOKING_REQUIRED, MAX_QUANTITY, type BookingImportReport } from '../../shared/schemas/bookings';
import { MAX_NAME } from '../../shared/schemas/common';
import type { ImportPreview } from '../../shared/schemas/imports';
import type { SessionUser } from '../../shared/schemas/auth';
import { audit } from '../audit';
import { badRequest } from '../http-error';
import { loadRefs, refProblems, type BookingRefs } from './bookings-refs';
import { replanAfter } from './replan';

// A file of hires and lessons (RFC 4180, header first): site, kind, fleet_number or model, quantity,
// start, end (the site's local time "2026-12-12 09:00", or ISO 8601 with an offset), title, repeat (RRULE).
// The file goes in whole or not at all: one row in error and nothing is stored.

const BATCH = 500;
const key = (s: string) => s.trim().toLowerCase();
type NewBooking = typeof bookings.$inferInsert;

function linesOf(csv: string): CsvLine[] {
  const { fields, lines } = readCsv(csv);
  const missing = missingColumns(fields, BOOKING_REQUIRED);
  if (!fields.includes('fleet_number') && !fields.includes('model')) missing.push('fleet_number or model');
  if (missing.length)
    throw badRequest(`The file lacks the column${missing.length > 1 ? 's' : ''} ${missing.join(', ')}. The first line must name the columns.`, missing.map((m) => ({ path: `csv.${m}`, message: 'Missing column.' })));
  if (!lines.length) throw badRequest('The file has a header but no rows.', [{ path: 'csv', message: 'No rows.' }]);
  return lines;
}

function checkLine(l: CsvLine, refs: BookingRefs): { errors: RowError[]; value: Omit<NewBooking, 'createdBy'> | null } {
  const d = l.data;
  const errors: RowError[] = [...l.errors];
  const site = d.site ? refs.siteByName.get(key(d.site)) : undefined;
  if (!site) errors.push({ field: 'site', message: d.site ? `No site is called “${d.site}”.` : 'Name the site, e.g. Quay Street.' });
  else if (!site.mine) errors.push({ field: 'site', message: `${d.site} is not one of your sites. You can only book at your own sites.` });
  const kind = key(d.kind ?? '');
  if (kind !== 'hire' && kind !== 'lesson') errors.push({ field: 'kind', message: 'Write hire or lesson.' });
  const fleet = d.fleet_number ?? '';
  const modelName = d.model ?? '';
  const bike = fleet ? refs.bikeByFleet.get(key(fleet)) : undefined;
  const modelId = modelName ? refs.modelByName.get(key(modelName)) : undefined;
  if (fleet && modelName) errors.push({ field: 'model', message: 'Give a fleet_number for one bike or a model and quantity, not both.' });
  else if (!fleet && !modelName) errors.push({ field: 'fleet_number', message: 'Name the bike (fleet_number) or the model and quantity.' });
  else if (fleet && !bike) errors.push({ field: 'fleet_number', message: `No bike has the fleet number ${fleet}.` });
  else if (modelName && !modelId) errors.push({ field: 'model', message: `No model is called “${modelName}”. Use a name from the models list.` });
  let quantity = 1;
  if (d.quantity) {
    if (!/^\d{1,4}$/.test(d.quantity) || Number(d.quantity) < 1 || Number(d.quantity) > MAX_QUANTITY) errors.push({ field: 'quantity', message: `Write the number of bikes as a whole number from 1 to ${MAX_QUANTITY}.` });
    else quantity = Number(d.quantity);
    if (fleet && quantity !== 1) errors.push({ field: 'quantity', message: 'A row for one bike has quantity 1. To book several, name the model.' });
  }
  const zone = site?.timeZone ?? 'Europe/London';
  const time = (field: 'start' | 'end') => {
    const t = parseBookingTime(d[field] ?? '', zone);
    if (t === null) errors.push({ field, message: `Write the ${field} as the site’s local time, e.g. 2026-12-12 09:00, or ISO 8601 with an offset.` });
    return t;
  };
  const start = time('start');
  const end = time('end');
  let rrule: string | null = null;
  if (d.repeat) {
    const c = checkRule(d.repeat);
    if (c.ok) rrule = c.rule;
    else errors.push({ field: 'repeat', message: c.message });
  }
  const title = d.title ?? '';
  if (title.length > MAX_NAME) errors.push({ field: 'title', message: `Keep the title under ${MAX_NAME} characters.` });
  if (errors.length || !site || start === null || end === null) return { errors, value: null };
  const draft = { siteId: site.id, bikeId: bike?.id ?? null, modelId: bike ? null : (modelId ?? null), quantity, start, end };
  for (const p of refProblems(refs, draft, { bike: 'fleet_number', model: 'model' })) errors.push(p);
  if (errors.length) return { errors, value: null };
  return {
    errors,
    value: {
      siteId: draft.siteId, kind: kind as 'hire' | 'lesson', bikeId: draft.bikeId, modelId: draft.modelId, quantity, startAt: new Date(start), endAt: new Date(end), rrule, title, source: 'csv',
    },
  };
}

async function check(db: DbOrTx, user: SessionUser, csv: string) {
  const lines = linesOf(csv);
  const refs = await loadRefs(db, user.siteIds);
  return lines.map((l) => ({ l, ...checkLine(l, refs) }));
}

export async function previewBookingImport(db: Db, user: SessionUser, csv: string): Promise<ImportPreview> {
  const rows = (await check(db, user, csv)).map(({ l, errors }) => ({ line: l.line, ok: errors.length === 0, errors, data: l.data }));
  const valid = rows.filter((r) => r.ok).length;
  return { rows, valid, invalid: rows.length - valid };
}

/** Stores every row in one transaction, or none when any row is in error (each error named by line and column). */
export async function runBookingImport(db: Db, user: SessionUser, csv: string, now: Date): Promise<BookingImportReport> {
  const { ids, siteIds } = await db.transaction(async (tx) => {
    const checked = await check(tx, user, csv);
    const bad = checked.filter((c) => c.errors.length);
    if (bad.length)
      throw badRequest(
        `${bad.length} row${bad.length > 1 ? 's have' : ' has'} errors, so nothing was imported. Correct ${bad.length > 1 ? 'them' : 'it'} (see the preview) and send the file again.`,
        bad.flatMap((c) => c.errors.map((e) => ({ path: `line ${c.l.line}.${e.field}`, message: e.message }))),
      );
    const values = checked.map((c) => ({ ...c.value!, createdBy: user.id, createdAt: now, updatedAt: now }));
    const ids: string[] = [];
    for (let i = 0; i < values.length; i += BATCH) ids.push(...(await tx.insert(bookings).values(values.slice(i, i + BATCH)).returning({ id: bookings.id })).map((r) => r.id));
    await audit(tx, { userId: user.id, action: 'import', entity: 'booking', changes: { rows: ids.length, bookingIds: ids } });
    return { ids, siteIds: [...new Set(values.map((v) => v.siteId))] };
  });
  await replanAfter(db, { siteIds, why: 'bookings imported' }, now);
  return { imported: ids.length, ids };
}
