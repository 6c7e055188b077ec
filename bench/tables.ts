/**
 * The tables the generator fills, as column lists with their PostgreSQL types: the bulk loader
 * writes COPY text for PGlite and typed `unnest` arrays for a PostgreSQL server from the same cells.
 */

export type Cell = string | number | boolean | null;

export interface TableSpec {
  name: string;
  columns: { name: string; type: string }[];
}

const spec = (name: string, cols: string): TableSpec => ({
  name,
  columns: cols.split(/\s*,\s*/).map((c) => {
    const [col, type] = c.split(/\s+/);
    return { name: col, type };
  }),
});

export const TABLES = {
  sites: spec('sites', 'id uuid, name text, time_zone text, bays int4'),
  users: spec('users', 'id uuid, email text, name text, role text, password_hash text'),
  userSites: spec('user_sites', 'user_id uuid, site_id uuid'),
  bikeModels: spec(
    'bike_models',
    'id uuid, name text, cylinders int4, intake_valves_per_cylinder int4, exhaust_valves_per_cylinder int4, adjuster text, ' +
      'intake_min_um int4, intake_max_um int4, exhaust_min_um int4, exhaust_max_um int4, shim_min_um int4, shim_max_um int4, shim_step_um int4',
  ),
  serviceItems: spec(
    'service_items',
    'id uuid, model_id uuid, name text, category text, every_km int4, every_months int4, first_at_km int4, rrule text, safety_critical bool, estimated_minutes int4',
  ),
  readingTemplates: spec(
    'reading_templates',
    'service_item_id uuid, label text, kind text, unit text, min float8, max float8, safety_critical bool, position int4',
  ),
  shimStock: spec('shim_stock', 'site_id uuid, size_um int4, condition text, count int4, min_count int4'),
  bikes: spec(
    'bikes',
    'id uuid, fleet_number text, vin text, registration text, model_id uuid, site_id uuid, odometer_unit text, in_service_date date, in_service_odometer float8, status text',
  ),
  odometerReadings: spec(
    'odometer_readings',
    'id uuid, bike_id uuid, date date, value float8, unit text, odometer_km float8, reset bool, source text, recorded_by uuid, created_at timestamptz',
  ),
  serviceRecords: spec('service_records', 'id uuid, bike_id uuid, service_item_id uuid, date date, odometer_km float8, done_by uuid, notes text, created_at timestamptz'),
  valveChecks: spec('valve_checks', 'id uuid, bike_id uuid, date date, odometer_km float8, checked_by uuid, created_at timestamptz'),
  valveReadings: spec(
    'valve_readings',
    'id uuid, check_id uuid, cylinder int4, side text, position int4, as_found_um int4, as_left_um int4, shim_before_um int4, shim_after_um int4, method text',
  ),
} as const;

export type TableKey = keyof typeof TABLES;

/** Parent tables first, so a batch never refers to a row that is not there yet. */
export const LOAD_ORDER: TableKey[] = [
  'sites', 'users', 'userSites', 'bikeModels', 'serviceItems', 'readingTemplates', 'shimStock',
  'bikes', 'odometerReadings', 'serviceRecords', 'valveChecks', 'valveReadings',
];

const camel = (snake: string) => snake.replace(/_([a-z])/g, (_, c: string) => c.toUpperCase());

/** Cells of an object row in the spec's column order (object keys are the camelCase column names). */
export function cellsOf(t: TableSpec, row: object): Cell[] {
  const r = row as Record<string, unknown>;
  return t.columns.map((c) => {
    const v = r[camel(c.name)];
    if (v === undefined || v === null) return null;
    if (v instanceof Date) return v.toISOString();
    return v as Cell;
  });
}
