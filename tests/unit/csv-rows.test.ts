import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import Papa from 'papaparse';
import {
  checkBikeRows, checkReadingRows, missingColumns, readCsv, BIKE_REQUIRED,
  type BikeImportContext, type ReadingBike,
} from '../../shared/domain/csv-rows';

const CRLF = '\r\n';

describe('readCsv: RFC 4180 section 2', () => {
  it('reads records ending in CRLF, the last one with or without it (rules 1–3)', () => {
    for (const text of [`a,b,c${CRLF}aaa,bbb,ccc${CRLF}zzz,yyy,xxx${CRLF}`, `a,b,c${CRLF}aaa,bbb,ccc${CRLF}zzz,yyy,xxx`]) {
      const { fields, lines } = readCsv(text);
      expect(fields).toEqual(['a', 'b', 'c']);
      expect(lines.map((l) => l.data)).toEqual([{ a: 'aaa', b: 'bbb', c: 'ccc' }, { a: 'zzz', b: 'yyy', c: 'xxx' }]);
      expect(lines.map((l) => l.line)).toEqual([2, 3]);
    }
  });

  it('keeps a comma inside a quoted field (rule 6)', () => {
    const { lines } = readCsv(`a,b${CRLF}"Quay Street, depot",x${CRLF}`);
    expect(lines[0].data.a).toBe('Quay Street, depot');
  });

  it('keeps CRLF inside a quoted field, and numbers the next record by its own first line (rule 6)', () => {
    const { lines } = readCsv(`a,b,c${CRLF}"aaa","b${CRLF}bb","ccc"${CRLF}zzz,yyy,xxx${CRLF}`);
    expect(lines[0].data.b).toBe(`b${CRLF}bb`);
    expect(lines.map((l) => l.line)).toEqual([2, 4]);
  });

  it('reads a doubled quote inside a quoted field as one quote (rule 7)', () => {
    const { lines } = readCsv(`a,b,c${CRLF}"aaa","b""bb","ccc"${CRLF}`);
    expect(lines[0].data.b).toBe('b"bb');
  });

  it('matches headers whatever their case and spacing, ignores a byte-order mark and blank lines', () => {
    const { fields, lines } = readCsv(`\uFEFF Fleet_Number ,DATE${CRLF}${CRLF}SM-07,2026-06-01${CRLF}`);
    expect(fields).toEqual(['fleet_number', 'date']);
    expect(lines).toHaveLength(1);
    expect(lines[0].line).toBe(3);
    expect(missingColumns(fields, ['fleet_number', 'date', 'odometer'])).toEqual(['odometer']);
  });

  it('marks a record with too few fields (rule 4: each line the same number of fields)', () => {
    const { lines } = readCsv(`a,b${CRLF}1${CRLF}`);
    expect(lines[0].errors[0].field).toBe('row');
  });

  it('reads back whatever papaparse writes, quotes, commas and line breaks included', () => {
    // papaparse's writer as the outside reference for RFC 4180 quoting.
    const cell = fc.string({ unit: fc.constantFrom('a', 'Z', '7', ',', '"', '\r\n', '\n', ' ', 'é'), maxLength: 12 });
    fc.assert(
      fc.property(fc.array(fc.tuple(cell, cell), { minLength: 1, maxLength: 8 }), (rows) => {
        const data = rows.filter(([x, y]) => `${x}${y}`.trim() !== '');
        const text = Papa.unparse({ fields: ['x', 'y'], data }, { newline: CRLF });
        const { lines } = readCsv(text);
        expect(lines.map((l) => [l.data.x, l.data.y])).toEqual(data.map(([x, y]) => [x.trim(), y.trim()]));
      }),
    );
  });
});

const ctx: BikeImportContext = {
  models: new Map([['strider 125', '00000000-0000-4000-8000-0000000000aa'], ['ridgeback 400', '00000000-0000-4000-8000-0000000000bb']]),
  sites: new Map([
    ['quay street', { id: '00000000-0000-4000-8000-000000000001', mine: true, today: '2026-06-15' }],
    ['airfield', { id: '00000000-0000-4000-8000-000000000002', mine: false, today: '2026-06-15' }],
  ]),
  fleetNumbers: new Set(['sm-01']),
};
const bikesCsv = (...rows: string[]) => readCsv(['fleet_number,registration,vin,model,site,odometer_unit,in_service_date,in_service_odometer', ...rows].join(CRLF)).lines;
const fieldsOf = (r: { errors: { field: string }[] }) => r.errors.map((e) => e.field);

describe('checkBikeRows', () => {
  it('accepts a well-formed bike and resolves model and site', () => {
    const [r] = checkBikeRows(bikesCsv('SM-30,SM26 ABC,SMH0A1B2C3D4E5F67,Strider 125,Quay Street,km,2026-03-01,12'), ctx);
    expect(r.errors).toEqual([]);
    expect(r.ok).toBe(true);
    expect(r.value).toMatchObject({ fleetNumber: 'SM-30', vin: 'SMH0A1B2C3D4E5F67', odometerUnit: 'km', inServiceDate: '2026-03-01', inServiceOdometer: 12 });
  });

  it('applies the VIN rule of ISO 3779: 17 characters, digits and capitals except I, O and Q', () => {
    const vins = ['SMH0A1B2C3D4E5F67', 'smh0a1b2c3d4e5f67', '', 'SMH0A1B2C3D4E5F6', 'SMH0A1B2C3D4E5F678', 'SMHIA1B2C3D4E5F67', 'SMHOA1B2C3D4E5F67', 'SMHQA1B2C3D4E5F67'];
    const rows = checkBikeRows(bikesCsv(...vins.map((v, i) => `SM-4${i},,${v},Strider 125,Quay Street,km,2026-03-01,0`)), ctx);
    expect(rows.map((r) => fieldsOf(r).includes('vin'))).toEqual([false, false, false, true, true, true, true, true]);
    expect(rows[2].value?.vin ?? null).toBeNull();
  });

  it('names each bad field: unknown model, unknown site, another site, bad date, future date, bad number, bad unit', () => {
    const rows = checkBikeRows(
      bikesCsv(
        'SM-31,,,Comet 50,Quay Street,km,2026-03-01,0',
        'SM-32,,,Strider 125,Harbour,km,2026-03-01,0',
        'SM-33,,,Strider 125,Airfield,km,2026-03-01,0',
        'SM-34,,,Strider 125,Quay Street,km,2026-02-30,0',
        'SM-35,,,Strider 125,Quay Street,km,2026-06-16,0',
        'SM-36,,,Strider 125,Quay Street,km,2026-03-01,"12,500"',
        'SM-37,,,Strider 125,Quay Street,furlongs,2026-03-01,0',
      ),
      ctx,
    );
    expect(rows.map(fieldsOf)).toEqual([['model'], ['site'], ['site'], ['in_service_date'], ['in_service_date'], ['in_service_odometer'], ['odometer_unit']]);
    expect(rows[2].errors[0].message).toContain('not one of your sites');
    expect(rows.every((r) => !r.ok && r.value === null)).toBe(true);
  });

  it('refuses a fleet number twice in the file (naming the other line) or already in the fleet, in any case', () => {
    const rows = checkBikeRows(
      bikesCsv('SM-50,,,Strider 125,Quay Street,km,2026-03-01,0', 'sm-50,,,Strider 125,Quay Street,km,2026-03-01,0', 'Sm-01,,,Strider 125,Quay Street,km,2026-03-01,0'),
      ctx,
    );
    expect(rows.map(fieldsOf)).toEqual([['fleet_number'], ['fleet_number'], ['fleet_number']]);
    expect(rows[0].errors[0].message).toContain('line 3');
    expect(rows[2].errors[0].message).toContain('already in the fleet');
  });

  it('lists the required columns a bikes file lacks', () => {
    expect(missingColumns(['fleet_number', 'vin'], BIKE_REQUIRED)).toEqual(['model', 'site', 'in_service_date']);
  });
});

const bike = (over: Partial<ReadingBike> = {}): ReadingBike => ({ id: 'b1', mine: true, retired: false, unit: 'km', today: '2026-06-15', last: null, ...over });
const readingsCsv = (...rows: string[]) => readCsv(['fleet_number,date,odometer', ...rows].join(CRLF)).lines;

describe('checkReadingRows', () => {
  it('sorts each bike’s rows by date before judging them, and refuses one going backwards', () => {
    const rows = checkReadingRows(
      readingsCsv('SM-07,2026-06-10,1500', 'SM-07,2026-06-01,1000', 'SM-07,2026-06-05,900', 'SM-08,2026-06-02,50'),
      new Map([['sm-07', bike()], ['sm-08', bike({ id: 'b2' })]]),
    );
    expect(rows.map((r) => r.ok)).toEqual([true, true, false, true]);
    expect(rows[2].errors[0]).toMatchObject({ field: 'odometer' });
    expect(rows[2].errors[0].message).toContain('line 3');
  });

  it('judges the first row against the bike’s last stored reading', () => {
    const last = { date: '2026-06-01', value: 5000, unit: 'km' as const };
    const rows = checkReadingRows(
      readingsCsv('SM-07,2026-06-02,4999', 'SM-07,2026-05-30,5100', 'SM-07,2026-06-01,5000', 'SM-07,2026-06-03,5200'),
      new Map([['sm-07', bike({ last })]]),
    );
    expect(rows.map((r) => r.errors.map((e) => e.message.split(' ')[0]))).toEqual([['Goes'], ['Before'], ['Already'], []]);
  });

  it('compares a miles odometer in miles (1 mile = 1.609344 km exactly, 1959 agreement)', () => {
    const rows = checkReadingRows(readingsCsv('SM-09,2026-06-02,100', 'SM-09,2026-06-03,101'), new Map([['sm-09', bike({ unit: 'mi' })]]));
    expect(rows.map((r) => r.value?.unit)).toEqual(['mi', 'mi']);
  });

  it('refuses an unknown bike, another site’s bike, a retired bike, a future date and a bad number', () => {
    const rows = checkReadingRows(
      readingsCsv('SM-99,2026-06-01,10', 'SM-20,2026-06-01,10', 'SM-21,2026-06-01,10', 'SM-07,2026-06-16,10', 'SM-07,2026-06-01,ten'),
      new Map([['sm-07', bike()], ['sm-20', bike({ id: 'b20', mine: false })], ['sm-21', bike({ id: 'b21', retired: true })]]),
    );
    expect(rows.map(fieldsOf)).toEqual([['fleet_number'], ['fleet_number'], ['fleet_number'], ['date'], ['odometer']]);
    expect(rows[1].errors[0].message).toContain('site you do not work at');
  });

  it('accepts any readings that rise with the date, whatever order the file lists them in', () => {
    fc.assert(
      fc.property(fc.uniqueArray(fc.integer({ min: 1, max: 300 }), { minLength: 1, maxLength: 40 }), fc.integer({ min: 1, max: 900 }), (days, perDay) => {
        const sortedDays = [...days].sort((a, b) => a - b);
        const date = (d: number) => new Date(Date.UTC(2025, 0, d)).toISOString().slice(0, 10);
        const lines = days.map((d) => `SM-07,${date(d)},${sortedDays.indexOf(d) * perDay + perDay}`);
        const rows = checkReadingRows(readingsCsv(...lines), new Map([['sm-07', bike()]]));
        expect(rows.every((r) => r.ok)).toBe(true);
      }),
    );
  });
});
