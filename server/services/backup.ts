import { readFile, stat } from 'node:fs/promises';
import type { Writable } from 'node:stream';
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { users } from '../db/schema';
import { audit } from '../audit';
import { HttpError } from '../http-error';
import type { BlobStore } from '../storage/types';
import type { RestoreReport } from '../../shared/schemas/imports';
import { readCatalog, schemaVersion, shapeDifferences, viaDrizzle, type TableInfo } from './backup-catalog';
import { DATABASE_MAX_BYTES, writeArchive, type DumpFormat, type Manifest, type SchemaVersion } from './backup-archive';
import { checkArchive, damaged, isArchive } from './backup-archive-read';
import { NOT_RESTORED, keysInDump, namedKeys, notBackup, openBareDump, openDump, replaceAll, snapshot, type Source } from './backup-dump';
import { countAbsent, putFiles, removeFiles, type FilesPut } from './backup-files';

// A backup is one archive: the database dump, every stored file the attachment rows name, and a
// manifest with each file's size and SHA-256 (see backup-archive.ts). A restore checks all of it
// before it changes anything, writes the files, then replaces the rows in one transaction; if that
// fails, the files it wrote are taken back out. Afterwards the store holds what the restored rows
// name: files that only the replaced rows named are removed, since no screen could reach them.
// Older backups (a bare data directory or JSON dump) still restore, the database alone.

export interface BackupDeps {
  database: Database;
  store: BlobStore;
  log: (line: string, e?: unknown) => void;
}

/** Streams the whole backup to `out`; answers what went in. */
export async function writeBackup({ database, store }: BackupDeps, format: DumpFormat, now: Date, userId: string, out: Writable) {
  const snap = await snapshot(database, format, now);
  // Recorded before the first byte leaves: the file holds every password hash.
  await audit(database.db, { userId, action: 'backup', entity: 'database', changes: { format, files: snap.files.length, databaseBytes: snap.bytes.length } });
  return writeArchive(
    { createdAt: now, driver: database.kind, schemaVersion: snap.schemaVersion, database: { format, bytes: snap.bytes }, files: snap.files, read: (key) => store.get(key) },
    out,
  );
}

const describeVersion = (v: SchemaVersion) => `${v.migrations} migrations${v.lastMigrationAt ? `, the last of ${new Date(Number(v.lastMigrationAt)).toISOString().slice(0, 10)}` : ''}`;

const sameVersion = (a: SchemaVersion, b: SchemaVersion) => a.migrations === b.migrations && a.lastMigrationAt === b.lastMigrationAt;

/** The backup's schema version (from its manifest, and from the dump itself) and its tables match this server's. */
function checkFits(live: TableInfo[], liveVersion: SchemaVersion, source: Source, manifest?: Manifest) {
  for (const theirs of [manifest?.schemaVersion, source.schemaVersion])
    if (theirs && !sameVersion(theirs, liveVersion))
      throw new HttpError(409, 'conflict', 'This backup was made by a different version of Lashline. Nothing was changed. Restore it on the version that made it, then upgrade.', [
        { path: 'schemaVersion', message: `The backup’s database has ${describeVersion(theirs)}; this server’s has ${describeVersion(liveVersion)}.` },
      ]);
  const differences = shapeDifferences(live, source.tables, NOT_RESTORED);
  if (differences.length)
    throw new HttpError(409, 'conflict', 'This backup was made by a different version of Lashline: its tables do not match. Nothing was changed.', differences.slice(0, 50));
}

/** Every file the backup's rows name is in the archive, or was already missing when the backup was made. */
function checkFileList(manifest: Manifest, named: Set<string>) {
  const listed = new Set([...manifest.files.map((f) => f.key), ...manifest.missing]);
  const unlisted = [...named].filter((k) => !listed.has(k));
  const extra = [...listed].filter((k) => !named.has(k));
  if (unlisted.length || extra.length)
    throw damaged(`its file list does not match its database (${unlisted.length} files named by records but not listed, ${extra.length} listed but named by no record)`);
}

interface Opened {
  source: Source;
  manifest?: Manifest;
}

async function open(path: string): Promise<Opened> {
  if (await isArchive(path)) {
    const checked = await checkArchive(path);
    return { source: await openDump(checked.manifest.database.format, checked.database), manifest: checked.manifest };
  }
  if ((await stat(path)).size > DATABASE_MAX_BYTES) throw notBackup('it is not a backup archive, and too large to be a database dump');
  return { source: await openBareDump(await readFile(path)) };
}

/**
 * Replaces every table's rows and the stored files with the backup's, all or nothing.
 * `path` is the uploaded file; `workDir` a private directory for the restore's own use.
 */
export async function restore({ database, store, log }: BackupDeps, path: string, workDir: string, userId: string): Promise<RestoreReport> {
  const { source, manifest } = await open(path);
  try {
    const q = viaDrizzle(database.db);
    const live = await readCatalog(q);
    checkFits(live, await schemaVersion(q), source, manifest);
    const named = await keysInDump(source, live);
    if (manifest) checkFileList(manifest, named);

    // Checked through: from here on the store and then the database change.
    const files: FilesPut | undefined = manifest ? await putFiles(store, path, manifest, workDir) : undefined;
    let result: { tables: RestoreReport['tables']; unnamed: string[] };
    try {
      result = await database.db.transaction(async (tx) => {
        const before = await namedKeys(tx);
        const tables = await replaceAll(tx, live, source);
        const after = await namedKeys(tx);
        const [still] = await tx.select({ id: users.id }).from(users).where(eq(users.id, userId));
        await audit(tx, {
          userId: still ? userId : null,
          action: 'restore',
          entity: 'database',
          changes: { format: source.format, tables, files: files ? { restored: files.restored, bytes: files.bytes } : 'not in the backup' },
        });
        return { tables, unnamed: [...before].filter((k) => !after.has(k)) };
      });
    } catch (e) {
      await files?.undo();
      throw e;
    }
    const inArchive = new Set(manifest?.files.map((f) => f.key));
    const missing = await countAbsent(store, [...named].filter((k) => !inArchive.has(k)));
    const removed = await removeFiles(store, result.unnamed, log);
    return {
      format: source.format,
      tables: result.tables,
      files: {
        included: !!manifest,
        named: named.size,
        restored: files?.restored ?? 0,
        bytes: files?.bytes ?? 0,
        alreadyStored: files?.alreadyStored ?? 0,
        missing,
        removed,
      },
      signedOut: true,
    };
  } finally {
    await source.close();
  }
}
