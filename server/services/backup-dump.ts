import { PGlite } from '@electric-sql/pglite';
import { sql } from 'drizzle-orm';
import { z } from 'zod';
import type { Database, DbOrTx, Tx } from '../db/client';
import { attachments } from '../db/schema';
import { badRequest } from '../http-error';
import type { RestoreReport } from '../../shared/schemas/imports';
import { THUMB_MIME } from './attachment-files';
import { quote, readCatalog, schemaVersion, viaDrizzle, type Query, type TableInfo } from './backup-catalog';
import { SchemaVersionSchema, type DumpFormat, type SchemaVersion, type StoredFile } from './backup-archive';

// The database side of a backup, in two formats with one restore path.
// - On PGlite the dump is the data directory itself (dumpDataDir, gzip): exact, and quick to make.
// - On PostgreSQL, or on request, it is a portable JSON dump: schema version, then every table's rows
//   in dependency order. It restores on either driver, across PostgreSQL versions.
// Restoring reads the dump into a source (a throwaway in-memory PGlite for a data directory), then
// replaces the live rows table by table inside the caller's transaction.
// Sessions are never restored: everyone signs in again.

export const JSON_FORMAT = 'lashline-backup';
// The data version counter stays the live database's own: the restore's writes move it on, so no
// app instance keeps serving answers it cached before the restore.
const KEPT = new Set(['data_versions']);
// Sessions and the stored answers of repeated requests belong to the running server, not to the data.
export const NOT_RESTORED: ReadonlySet<string> = new Set(['sessions', 'idempotent_requests', ...KEPT]);
const CHUNK = 5000;

const orderBy = (t: TableInfo) => (t.key.length ? t.key.map(quote).join(', ') : `${quote(t.name)}::text`);
const chunkSql = (t: TableInfo, offset: number) =>
  `select coalesce(json_agg(row_to_json(x))::text, '[]') as j from (select * from ${quote(t.name)} order by ${orderBy(t)} limit ${CHUNK} offset ${offset}) x`;
const countOf = async (q: Query, table: string) => Number((await q<{ n: number }>(`select count(*)::int as n from ${quote(table)}`))[0].n);

/** The files the attachment rows name: each original, and its preview when it has one. */
async function storedFiles(db: DbOrTx): Promise<StoredFile[]> {
  const rows = await db
    .select({ key: attachments.storageKey, thumb: attachments.thumbKey, mime: attachments.mime })
    .from(attachments)
    .orderBy(attachments.createdAt, attachments.id);
  return rows.flatMap((r) => [{ key: r.key, contentType: r.mime }, ...(r.thumb ? [{ key: r.thumb, contentType: THUMB_MIME }] : [])]);
}

/** The keys the attachment rows name, originals and previews. */
export async function namedKeys(db: DbOrTx): Promise<Set<string>> {
  return new Set((await storedFiles(db)).map((f) => f.key));
}

export interface Snapshot {
  format: DumpFormat;
  bytes: Buffer;
  schemaVersion: SchemaVersion;
  /** Read in the same snapshot as the dump, so every row's files are listed and no others. */
  files: StoredFile[];
}

/** The database dump and the list of files its rows name, both as of one moment. */
export async function snapshot(database: Database, format: DumpFormat, now: Date): Promise<Snapshot> {
  if (format === 'data-dir') {
    const pglite = database.pglite!;
    // PGlite is one connection: while this transaction is open nothing else writes, and the dump
    // (which takes only the query lock) sees the same rows the file list was read from.
    return database.db.transaction(
      async (tx) => {
        const files = await storedFiles(tx);
        const version = await schemaVersion(viaDrizzle(tx));
        const bytes = Buffer.from(await (await pglite.dumpDataDir('gzip')).arrayBuffer());
        return { format, bytes, schemaVersion: version, files };
      },
      { accessMode: 'read only' },
    );
  }
  return database.db.transaction(
    async (tx) => {
      const q = viaDrizzle(tx);
      const files = await storedFiles(tx);
      const tables = (await readCatalog(q)).filter((t) => !NOT_RESTORED.has(t.name));
      const version = await schemaVersion(q);
      const head = { format: JSON_FORMAT, version: 1, createdAt: now.toISOString(), driver: database.kind, schemaVersion: version };
      // Written piece by piece, so no table is held twice in memory.
      const parts = [JSON.stringify(head).slice(0, -1), ',"tables":['];
      for (const [i, t] of tables.entries()) {
        parts.push(`${i ? ',' : ''}{"name":${JSON.stringify(t.name)},"columns":${JSON.stringify(t.columns)},"rows":[`);
        const n = await countOf(q, t.name);
        for (let offset = 0; offset < n; offset += CHUNK) {
          const [{ j }] = await q<{ j: string }>(chunkSql(t, offset));
          parts.push(`${offset ? ',' : ''}${j.slice(1, -1)}`);
        }
        parts.push(']}');
      }
      parts.push(']}');
      return { format, bytes: Buffer.concat(parts.map((p) => Buffer.from(p))), schemaVersion: version, files };
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  );
}

const JsonBackupSchema = z.object({
  format: z.literal(JSON_FORMAT),
  version: z.literal(1),
  schemaVersion: SchemaVersionSchema.optional(),
  tables: z.array(z.object({ name: z.string(), columns: z.array(z.object({ name: z.string(), type: z.string() })), rows: z.array(z.record(z.string(), z.unknown())) })),
});

export interface Source {
  format: RestoreReport['format'];
  tables: Pick<TableInfo, 'name' | 'columns'>[];
  /** Which migrations built the backed-up schema, when the dump says. */
  schemaVersion?: SchemaVersion;
  /** The table's rows as JSON arrays of at most CHUNK rows. */
  chunks(table: TableInfo): AsyncIterable<string>;
  close(): Promise<void>;
}

export const notBackup = (why: string) =>
  badRequest(`This file is not a Lashline backup, or it is damaged (${why}). Nothing was changed. Choose a file made by “Download a backup”.`, [{ path: 'file', message: why }]);

async function dataDirSource(file: Buffer): Promise<Source> {
  let pg: PGlite;
  try {
    pg = new PGlite({ loadDataDir: new Blob([new Uint8Array(file)]) });
    await pg.waitReady;
  } catch {
    throw notBackup('the database in it does not open');
  }
  const q: Query = async <R>(text: string) => (await pg.query<R>(text)).rows;
  try {
    const tables = await readCatalog(q);
    return {
      format: 'data-dir',
      tables,
      schemaVersion: await schemaVersion(q),
      async *chunks(t) {
        const mine = tables.find((x) => x.name === t.name)!;
        const n = await countOf(q, t.name);
        for (let offset = 0; offset < n; offset += CHUNK) yield (await q<{ j: string }>(chunkSql(mine, offset)))[0].j;
      },
      close: () => pg.close(),
    };
  } catch (e) {
    await pg.close();
    throw e;
  }
}

function jsonSource(file: Buffer): Source {
  let parsed: z.infer<typeof JsonBackupSchema>;
  try {
    parsed = JsonBackupSchema.parse(JSON.parse(file.toString('utf8')));
  } catch {
    throw notBackup('its contents are not a Lashline JSON dump');
  }
  return {
    format: 'json',
    tables: parsed.tables,
    schemaVersion: parsed.schemaVersion,
    async *chunks(t) {
      const rows = parsed.tables.find((x) => x.name === t.name)?.rows ?? [];
      for (let i = 0; i < rows.length; i += CHUNK) yield JSON.stringify(rows.slice(i, i + CHUNK));
    },
    close: async () => {},
  };
}

/** A dump of a known format, as found inside a backup archive. */
export const openDump = (format: DumpFormat, bytes: Buffer) => (format === 'data-dir' ? dataDirSource(bytes) : Promise.resolve(jsonSource(bytes)));

/** An older backup: the dump alone. Gzip (1f 8b) or a plain tar ("ustar" at 257) is a data directory; "{" is the JSON dump. */
export async function openBareDump(file: Buffer): Promise<Source> {
  if (file.length > 2 && file[0] === 0x1f && file[1] === 0x8b) return dataDirSource(file);
  if (file.length > 262 && file.subarray(257, 262).toString('latin1') === 'ustar') return dataDirSource(file);
  const first = file.subarray(0, 64).toString('utf8').trimStart()[0];
  if (first === '{') return jsonSource(file);
  throw notBackup('neither a backup archive nor a database dump');
}

/** The keys the backup's attachment rows name. */
export async function keysInDump(source: Source, live: TableInfo[]): Promise<Set<string>> {
  const keys = new Set<string>();
  const table = live.find((t) => t.name === 'attachments');
  if (!table) return keys;
  for await (const chunk of source.chunks(table))
    for (const row of JSON.parse(chunk) as { storage_key?: unknown; thumb_key?: unknown }[])
      for (const k of [row.storage_key, row.thumb_key]) if (typeof k === 'string') keys.add(k);
  return keys;
}

/**
 * A row the database refuses (SQLSTATE class 22, data exception, or 23, integrity constraint
 * violation): the backup's rows are damaged, not the server. Anything else stays unexpected.
 */
function rowsDoNotFit(table: string, e: unknown) {
  const cause = (e as { cause?: { code?: unknown; message?: unknown } }).cause ?? (e as { code?: unknown; message?: unknown });
  if (typeof cause?.code !== 'string' || !/^2[23]/.test(cause.code)) return e;
  return badRequest(`This backup is damaged: rows of ${table} do not fit this database. Nothing was changed. Make a new backup, or choose another copy of this one.`, [
    { path: table, message: String(cause.message ?? cause.code).slice(0, 300) },
  ]);
}

/** Replaces every restored table's rows with the source's; the caller's transaction makes it all or nothing. */
export async function replaceAll(tx: Tx, live: TableInfo[], source: Source) {
  await tx.execute(sql.raw(`truncate ${live.filter((t) => !KEPT.has(t.name)).map((t) => quote(t.name)).join(', ')}`));
  const q = viaDrizzle(tx);
  const counts: RestoreReport['tables'] = [];
  for (const t of live) {
    if (NOT_RESTORED.has(t.name)) continue;
    for await (const chunk of source.chunks(t)) {
      try {
        await tx.execute(sql`insert into ${sql.identifier(t.name)} select * from json_populate_recordset(null::${sql.identifier(t.name)}, ${chunk}::json)`);
      } catch (e) {
        throw rowsDoNotFit(t.name, e);
      }
    }
    for (const s of t.sequences)
      await q(`select setval('${s.sequence.replace(/'/g, "''")}', coalesce((select max(${quote(s.column)}) from ${quote(t.name)}), 0) + 1, false)`);
    counts.push({ name: t.name, rows: await countOf(q, t.name) });
  }
  return counts;
}
