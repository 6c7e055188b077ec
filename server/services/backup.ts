import { PGlite } from '@electric-sql/pglite';
import { eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import type { Database, Tx } from '../db/client';
import { users } from '../db/schema';
import { audit } from '../audit';
import { HttpError, badRequest } from '../http-error';
import type { RestoreReport } from '../../shared/schemas/imports';
import { quote, readCatalog, schemaVersion, shapeDifferences, viaDrizzle, type Query, type TableInfo } from './backup-catalog';

// Two backup formats, one restore path.
// - On PGlite the backup is the data directory itself (dumpDataDir, gzip): exact, and quick to make.
// - On PostgreSQL, or on request, it is a portable JSON dump: schema version, then every table's rows
//   in dependency order. It restores on either driver, across PostgreSQL versions.
// Restoring reads the file into a source (a throwaway in-memory PGlite for a data directory), checks
// that its tables and columns match this version, then replaces the live rows table by table in one
// transaction, so a running server keeps its single database connection and a failure changes nothing.
// Sessions are never restored: everyone signs in again.

export const JSON_FORMAT = 'lashline-backup';
// The data version counter stays the live database's own: the restore's writes move it on, so no
// app instance keeps serving answers it cached before the restore.
const KEPT = new Set(['data_versions']);
const NOT_RESTORED = new Set(['sessions', ...KEPT]);
const CHUNK = 5000;

const orderBy = (t: TableInfo) => (t.key.length ? t.key.map(quote).join(', ') : `${quote(t.name)}::text`);
const chunkSql = (t: TableInfo, offset: number) =>
  `select coalesce(json_agg(row_to_json(x))::text, '[]') as j from (select * from ${quote(t.name)} order by ${orderBy(t)} limit ${CHUNK} offset ${offset}) x`;
const countOf = async (q: Query, table: string) => Number((await q<{ n: number }>(`select count(*)::int as n from ${quote(table)}`))[0].n);

/** The portable dump, written as text piece by piece so no table is held twice in memory. */
export async function jsonDump(database: Database, now: Date): Promise<string> {
  return database.db.transaction(
    async (tx) => {
      const q = viaDrizzle(tx);
      const tables = (await readCatalog(q)).filter((t) => !NOT_RESTORED.has(t.name));
      const head = { format: JSON_FORMAT, version: 1, createdAt: now.toISOString(), driver: database.kind, schemaVersion: await schemaVersion(q) };
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
      return parts.join('');
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  );
}

const JsonBackupSchema = z.object({
  format: z.literal(JSON_FORMAT),
  version: z.literal(1),
  tables: z.array(z.object({ name: z.string(), columns: z.array(z.object({ name: z.string(), type: z.string() })), rows: z.array(z.record(z.string(), z.unknown())) })),
});

interface Source {
  format: RestoreReport['format'];
  tables: Pick<TableInfo, 'name' | 'columns'>[];
  /** The table's rows as JSON arrays of at most CHUNK rows. */
  chunks(table: TableInfo): AsyncIterable<string>;
  close(): Promise<void>;
}

const notBackup = (why: string) => badRequest(`This file is not a Lashline backup, or it is damaged (${why}). Choose a file made by “Download a backup”.`, [{ path: 'file', message: why }]);

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
    async *chunks(t) {
      const rows = parsed.tables.find((x) => x.name === t.name)?.rows ?? [];
      for (let i = 0; i < rows.length; i += CHUNK) yield JSON.stringify(rows.slice(i, i + CHUNK));
    },
    close: async () => {},
  };
}

/** Gzip (1f 8b) or a plain tar ("ustar" at 257) is a data directory; "{" is the JSON dump. */
async function openSource(file: Buffer): Promise<Source> {
  if (file.length > 2 && file[0] === 0x1f && file[1] === 0x8b) return dataDirSource(file);
  if (file.length > 262 && file.subarray(257, 262).toString('latin1') === 'ustar') return dataDirSource(file);
  const first = file.subarray(0, 64).toString('utf8').trimStart()[0];
  if (first === '{') return jsonSource(file);
  throw notBackup('neither a data directory nor a JSON dump');
}

async function replaceAll(tx: Tx, live: TableInfo[], source: Source) {
  await tx.execute(sql.raw(`truncate ${live.filter((t) => !KEPT.has(t.name)).map((t) => quote(t.name)).join(', ')}`));
  const q = viaDrizzle(tx);
  const counts: RestoreReport['tables'] = [];
  for (const t of live) {
    if (NOT_RESTORED.has(t.name)) continue;
    for await (const chunk of source.chunks(t))
      await tx.execute(sql`insert into ${sql.identifier(t.name)} select * from json_populate_recordset(null::${sql.identifier(t.name)}, ${chunk}::json)`);
    for (const s of t.sequences)
      await q(`select setval('${s.sequence.replace(/'/g, "''")}', coalesce((select max(${quote(s.column)}) from ${quote(t.name)}), 0) + 1, false)`);
    counts.push({ name: t.name, rows: await countOf(q, t.name) });
  }
  return counts;
}

/** Replaces every table's rows with the backup's, all or nothing. */
export async function restore(database: Database, file: Buffer, userId: string): Promise<RestoreReport> {
  const source = await openSource(file);
  try {
    return await database.db.transaction(async (tx) => {
      const live = await readCatalog(viaDrizzle(tx));
      const differences = shapeDifferences(live, source.tables, NOT_RESTORED);
      if (differences.length)
        throw new HttpError(409, 'conflict', 'This backup was made by a different version of Lashline: its tables do not match. Nothing was changed.', differences.slice(0, 50));
      const tables = await replaceAll(tx, live, source);
      const [still] = await tx.select({ id: users.id }).from(users).where(eq(users.id, userId));
      await audit(tx, { userId: still ? userId : null, action: 'restore', entity: 'database', changes: { format: source.format, tables } });
      return { format: source.format, tables, signedOut: true as const };
    });
  } finally {
    await source.close();
  }
}
