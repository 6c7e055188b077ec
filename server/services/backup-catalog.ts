import { sql } from 'drizzle-orm';
import type { DbOrTx } from '../db/client';

/** Runs SQL text and gives its rows: the live database through Drizzle, or a PGlite opened from a backup. */
export type Query = <R = Record<string, unknown>>(text: string) => Promise<R[]>;

export const viaDrizzle = (db: DbOrTx): Query => async <R>(text: string) => ((await db.execute(sql.raw(text))) as unknown as { rows: R[] }).rows;

export interface Column {
  name: string;
  type: string;
}
export interface TableInfo {
  name: string;
  columns: Column[];
  /** The primary key's columns, so rows come out in a stable order. */
  key: string[];
  /** Columns filled from a sequence, whose sequence must move past the restored rows. */
  sequences: { column: string; sequence: string }[];
}

export const quote = (identifier: string) => `"${identifier.replace(/"/g, '""')}"`;

/** Every table in the public schema, parents before the tables that reference them. */
export async function readCatalog(q: Query): Promise<TableInfo[]> {
  // One after the other: a restore reads this inside its transaction, on one connection.
  const tables = await q<{ name: string }>(`select c.relname as name from pg_class c join pg_namespace n on n.oid = c.relnamespace where n.nspname = 'public' and c.relkind in ('r', 'p')`);
  const columns = await q<{ table_name: string; column_name: string; data_type: string }>(
    `select table_name, column_name, data_type from information_schema.columns where table_schema = 'public' order by table_name, ordinal_position`,
  );
  const keys = await q<{ name: string; col: string; pos: number }>(
    `select c.relname as name, a.attname as col, array_position(k.conkey, a.attnum) as pos from pg_constraint k
     join pg_class c on c.oid = k.conrelid join pg_namespace n on n.oid = c.relnamespace
     join pg_attribute a on a.attrelid = c.oid and a.attnum = any(k.conkey)
     where k.contype = 'p' and n.nspname = 'public' order by 1, 3`,
  );
  const links = await q<{ child: string; parent: string }>(
    `select tc.relname as child, pc.relname as parent from pg_constraint k
     join pg_class tc on tc.oid = k.conrelid join pg_class pc on pc.oid = k.confrelid join pg_namespace n on n.oid = tc.relnamespace
     where k.contype = 'f' and n.nspname = 'public'`,
  );
  const sequences = await q<{ table_name: string; column_name: string; seq: string | null }>(
    `select table_name, column_name, pg_get_serial_sequence(quote_ident(table_name), column_name) as seq from information_schema.columns
     where table_schema = 'public' and (column_default like 'nextval(%' or is_identity = 'YES')`,
  );
  const info = new Map<string, TableInfo>(tables.map((t) => [t.name, { name: t.name, columns: [], key: [], sequences: [] }]));
  for (const c of columns) info.get(c.table_name)?.columns.push({ name: c.column_name, type: c.data_type });
  for (const k of keys) info.get(k.name)?.key.push(k.col);
  for (const s of sequences) if (s.seq) info.get(s.table_name)?.sequences.push({ column: s.column_name, sequence: s.seq });
  return dependencyOrder([...info.values()], links);
}

/** Kahn's topological sort, by name among equals, so the order is the same on every run. */
function dependencyOrder(tables: TableInfo[], links: { child: string; parent: string }[]): TableInfo[] {
  const parents = new Map(tables.map((t) => [t.name, new Set<string>()]));
  for (const l of links) if (l.child !== l.parent) parents.get(l.child)?.add(l.parent);
  const out: TableInfo[] = [];
  const left = new Map(tables.map((t) => [t.name, t]));
  while (left.size) {
    const ready = [...left.values()].filter((t) => [...parents.get(t.name)!].every((p) => !left.has(p))).sort((a, b) => a.name.localeCompare(b.name));
    if (!ready.length) throw new Error(`Tables reference each other in a cycle: ${[...left.keys()].join(', ')}`);
    for (const t of ready) {
      out.push(t);
      left.delete(t.name);
    }
  }
  return out;
}

/** Which migrations built the schema (Drizzle's own journal), for telling backups of different versions apart. */
export async function schemaVersion(q: Query) {
  const [exists] = await q<{ ok: boolean }>(`select to_regclass('drizzle.__drizzle_migrations') is not null as ok`);
  if (!exists?.ok) return { migrations: 0, lastMigrationAt: null };
  const [row] = await q<{ n: number; last: string | null }>(`select count(*)::int as n, max(created_at)::text as last from drizzle.__drizzle_migrations`);
  return { migrations: Number(row.n), lastMigrationAt: row.last };
}

/** The differences that stop a backup's rows fitting this database's tables, by table and column. */
export function shapeDifferences(live: TableInfo[], backup: Pick<TableInfo, 'name' | 'columns'>[], skip: ReadonlySet<string>) {
  const out: { path: string; message: string }[] = [];
  const theirs = new Map(backup.map((t) => [t.name, t]));
  for (const t of live) {
    if (skip.has(t.name)) continue;
    const other = theirs.get(t.name);
    if (!other) {
      out.push({ path: t.name, message: 'Not in the backup.' });
      continue;
    }
    const mine = new Set(t.columns.map((c) => `${c.name}:${c.type}`));
    const them = new Set(other.columns.map((c) => `${c.name}:${c.type}`));
    for (const c of mine) if (!them.has(c)) out.push({ path: `${t.name}.${c.split(':')[0]}`, message: 'Missing or of another type in the backup.' });
    for (const c of them) if (!mine.has(c)) out.push({ path: `${t.name}.${c.split(':')[0]}`, message: 'Not in this version of Lashline.' });
  }
  const names = new Set(live.map((t) => t.name));
  for (const t of backup) if (!names.has(t.name) && !skip.has(t.name)) out.push({ path: t.name, message: 'Not in this version of Lashline.' });
  return out;
}
