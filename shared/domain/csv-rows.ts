import Papa from 'papaparse';
import { BikeCreateSchema, type BikeCreate } from '../schemas/bikes';
import { IsoDateSchema } from '../schemas/common';
import { compareIso, type IsoDate } from './dates';
import { validateNextReading, type OdometerReading } from './odometer';
import type { OdometerUnit } from './units';

// Rows of a fleet or odometer file (RFC 4180, header row first), checked before anything is stored.
// The checks are pure: the caller hands in what the fleet already holds.

export type CsvRecord = Record<string, string>;
export interface RowError {
  field: string;
  message: string;
}
/** `line` is the file line the record starts on (the header is line 1). */
export interface CsvLine {
  line: number;
  data: CsvRecord;
  errors: RowError[];
}
export interface CheckedRow<T> extends CsvLine {
  ok: boolean;
  value: T | null;
}

export const BIKE_COLUMNS = ['fleet_number', 'registration', 'vin', 'model', 'site', 'odometer_unit', 'in_service_date', 'in_service_odometer'] as const;
export const BIKE_REQUIRED = ['fleet_number', 'model', 'site', 'in_service_date'] as const;
export const READING_COLUMNS = ['fleet_number', 'date', 'odometer'] as const;
export const MAX_ODOMETER = 2_000_000;

const key = (s: string) => s.trim().toLowerCase();
const newlines = (s: string) => (s.match(/\n/g) ?? []).length;

/** Reads CSV text into records keyed by lower-case header, each with the line it starts on. */
export function readCsv(text: string): { fields: string[]; lines: CsvLine[] } {
  const src = text.replace(/^\uFEFF/, '');
  const lines: CsvLine[] = [];
  let fields: string[] = [];
  let scanned = 0;
  let breaks = 0;
  Papa.parse<CsvRecord>(src, {
    header: true,
    skipEmptyLines: 'greedy',
    transformHeader: key,
    step: (r) => {
      fields = r.meta.fields ?? fields;
      // meta.cursor is just past the record and its line break; a quoted field may hold line breaks of its own.
      breaks += newlines(src.slice(scanned, r.meta.cursor));
      scanned = r.meta.cursor;
      const endLine = 1 + breaks - (src[scanned - 1] === '\n' ? 1 : 0);
      const data: CsvRecord = {};
      let inside = 0;
      for (const [k, v] of Object.entries(r.data)) {
        if (typeof v !== 'string') continue;
        inside += newlines(v);
        data[k] = v.trim();
      }
      const errors = r.errors.map((e) => ({ field: 'row', message: rowProblem(e, fields.length) }));
      lines.push({ line: endLine - inside, data, errors });
    },
  });
  return { fields, lines };
}

function rowProblem(e: Papa.ParseError, width: number) {
  if (e.code === 'TooFewFields' || e.code === 'TooManyFields') return `This row does not have ${width} fields like the header. Check for a missing or extra comma.`;
  return `The quotes in this row do not pair up (${e.message}).`;
}

/** The required columns a file lacks. */
export const missingColumns = (fields: readonly string[], required: readonly string[]) => required.filter((c) => !fields.includes(c));

function parseOdometer(raw: string | undefined, field: string, errors: RowError[], empty?: number): number | null {
  const s = raw ?? '';
  if (s === '' && empty !== undefined) return empty;
  if (!/^\d+(\.\d+)?$/.test(s)) {
    errors.push({ field, message: 'Write the odometer as a plain number, e.g. 12500 or 12500.5 (no commas or units).' });
    return null;
  }
  const n = Number(s);
  if (n > MAX_ODOMETER) errors.push({ field, message: `An odometer above ${MAX_ODOMETER.toLocaleString('en-GB')} is not plausible. Check the digits.` });
  return n;
}

function parseDate(raw: string | undefined, field: string, today: IsoDate | undefined, errors: RowError[]): IsoDate | null {
  const d = IsoDateSchema.safeParse(raw ?? '');
  if (!d.success) {
    errors.push({ field, message: d.error.issues[0].message });
    return null;
  }
  if (today && compareIso(d.data, today) > 0) {
    errors.push({ field, message: `After today (${today}). Dates cannot be in the future.` });
    return null;
  }
  return d.data;
}

/** Lines sharing a key, so every one of them can name the others. */
function duplicates(lines: readonly CsvLine[], keyOf: (l: CsvLine) => string | null) {
  const by = new Map<string, number[]>();
  for (const l of lines) {
    const k = keyOf(l);
    if (k) by.set(k, [...(by.get(k) ?? []), l.line]);
  }
  return (l: CsvLine) => {
    const k = keyOf(l);
    const all = k ? (by.get(k) ?? []) : [];
    return all.length > 1 ? all.filter((n) => n !== l.line) : [];
  };
}

const finish = <T>(l: CsvLine, errors: RowError[], value: T | null): CheckedRow<T> => ({
  line: l.line,
  data: l.data,
  errors,
  ok: errors.length === 0 && value !== null,
  value: errors.length ? null : value,
});

export interface SiteRef {
  id: string;
  /** False for a site the importing person does not work at. */
  mine: boolean;
  today: IsoDate;
}
export interface BikeImportContext {
  /** Lower-case model name → id. */
  models: ReadonlyMap<string, string>;
  /** Lower-case site name → site. */
  sites: ReadonlyMap<string, SiteRef>;
  /** Lower-case fleet numbers already in the fleet, at any site. */
  fleetNumbers: ReadonlySet<string>;
}

const BIKE_FIELD: Record<string, string> = {
  fleetNumber: 'fleet_number', vin: 'vin', registration: 'registration', odometerUnit: 'odometer_unit',
  inServiceDate: 'in_service_date', inServiceOdometer: 'in_service_odometer', modelId: 'model', siteId: 'site',
};

export function checkBikeRows(lines: readonly CsvLine[], ctx: BikeImportContext): CheckedRow<BikeCreate>[] {
  const sameFleet = duplicates(lines, (l) => (l.data.fleet_number ? key(l.data.fleet_number) : null));
  return lines.map((l) => {
    const d = l.data;
    const errors = [...l.errors];
    const site = d.site ? ctx.sites.get(key(d.site)) : undefined;
    const modelId = d.model ? ctx.models.get(key(d.model)) : undefined;
    if (!modelId) errors.push({ field: 'model', message: d.model ? `No model is called “${d.model}”. Use a name from the models list.` : 'Name the model.' });
    if (!site) errors.push({ field: 'site', message: d.site ? `No site is called “${d.site}”.` : 'Name the site the bike works from.' });
    else if (!site.mine) errors.push({ field: 'site', message: `${d.site} is not one of your sites. You can only add bikes to your own sites.` });
    const others = sameFleet(l);
    if (others.length) errors.push({ field: 'fleet_number', message: `${d.fleet_number} is also on line ${others.join(', ')}. Each bike once.` });
    else if (d.fleet_number && ctx.fleetNumbers.has(key(d.fleet_number))) errors.push({ field: 'fleet_number', message: `${d.fleet_number} is already in the fleet. Fleet numbers must be unique.` });
    const unit = d.odometer_unit ? key(d.odometer_unit) : 'km';
    const odometer = parseOdometer(d.in_service_odometer, 'in_service_odometer', errors, 0);
    const date = parseDate(d.in_service_date, 'in_service_date', site?.today, errors);
    const parsed = BikeCreateSchema.safeParse({
      fleetNumber: d.fleet_number ?? '', vin: d.vin ?? '', registration: d.registration ?? '', modelId: modelId ?? '', siteId: site?.id ?? '',
      odometerUnit: unit, inServiceDate: date ?? '', inServiceOdometer: odometer ?? 0,
    });
    if (!parsed.success)
      for (const i of parsed.error.issues) {
        const field = BIKE_FIELD[String(i.path[0])] ?? 'row';
        // Fields already explained above keep their clearer message.
        if (!errors.some((e) => e.field === field)) errors.push({ field, message: field === 'odometer_unit' ? 'Write km or mi.' : i.message });
      }
    return finish(l, errors, parsed.success ? parsed.data : null);
  });
}

export interface ReadingBike {
  id: string;
  mine: boolean;
  retired: boolean;
  unit: OdometerUnit;
  /** The bike's site calendar date. */
  today: IsoDate;
  /** The latest reading stored for the bike. */
  last: OdometerReading | null;
}
export interface ReadingRow {
  bikeId: string;
  date: IsoDate;
  value: number;
  unit: OdometerUnit;
}

/**
 * Checks odometer rows: each bike's rows are taken in date order (file order within a day) and
 * each must follow the one before it, the first one following what the fleet already holds.
 */
export function checkReadingRows(lines: readonly CsvLine[], bikes: ReadonlyMap<string, ReadingBike>): CheckedRow<ReadingRow>[] {
  const first = lines.map((l) => {
    const errors = [...l.errors];
    const fleet = l.data.fleet_number ?? '';
    const bike = fleet ? bikes.get(key(fleet)) : undefined;
    if (!fleet) errors.push({ field: 'fleet_number', message: 'Name the bike by its fleet number.' });
    else if (!bike) errors.push({ field: 'fleet_number', message: `No bike has the fleet number ${fleet}.` });
    else if (!bike.mine) errors.push({ field: 'fleet_number', message: `${fleet} belongs to a site you do not work at.` });
    else if (bike.retired) errors.push({ field: 'fleet_number', message: `${fleet} is retired. A manager can bring it back first.` });
    const date = parseDate(l.data.date, 'date', bike?.today, errors);
    const value = parseOdometer(l.data.odometer, 'odometer', errors);
    return { l, errors, bike, row: bike && date && value !== null ? { bikeId: bike.id, date, value, unit: bike.unit } : null };
  });
  const order = first.map((_, i) => i).filter((i) => first[i].row && !first[i].errors.length);
  order.sort((a, b) => first[a].row!.bikeId.localeCompare(first[b].row!.bikeId) || compareIso(first[a].row!.date, first[b].row!.date) || a - b);
  const last = new Map<string, { reading: OdometerReading; line: number | null }>();
  for (const i of order) {
    const { row, bike, errors } = first[i];
    const prev = last.get(row!.bikeId) ?? (bike!.last ? { reading: bike!.last, line: null } : null);
    const where = prev?.line ? `line ${prev.line}` : 'the fleet';
    const next = { date: row!.date, value: row!.value, unit: row!.unit };
    const check = validateNextReading({ last: prev?.reading ?? null, next, today: bike!.today });
    if (prev && prev.reading.date === next.date && prev.reading.value === next.value) errors.push({ field: 'odometer', message: `Already recorded (${where}).` });
    else if (check.kind === 'before_last_date') errors.push({ field: 'date', message: `Before the last reading, ${check.lastDate}. Readings continue the bike’s history.` });
    else if (check.kind === 'lower_than_last') errors.push({ field: 'odometer', message: `Goes backwards: ${where} has ${check.lastValue} ${check.lastUnit} on ${check.lastDate}.` });
    else if (check.kind === 'big_jump') errors.push({ field: 'odometer', message: `${Math.round(check.km)} km in ${check.days || 1} day(s) after ${where}: more than 1,000 km a day. Check the digits.` });
    else last.set(row!.bikeId, { reading: next, line: first[i].l.line });
  }
  return first.map(({ l, errors, row }) => finish(l, errors, row));
}
