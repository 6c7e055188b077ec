import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import type { Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { createGunzip, createGzip } from 'node:zlib';
import tar from 'tar-stream';
import { z } from 'zod';
import type { DbKind } from '../db/client';
import { HttpError, badRequest } from '../http-error';

// One backup file, a gzipped tar: the database dump first, then every stored file, then the manifest.
// The manifest comes last so each file is read from the store once, its checksum taken on the way.
// Every entry sits under one folder; an older backup's data directory starts with the database's
// own folder name instead, which is how the two tell apart.

export const ARCHIVE_FORMAT = 'lashline-archive';
export const ROOT = 'lashline-backup/';
const MANIFEST = `${ROOT}manifest.json`;
const DATABASE = `${ROOT}database/`;
const FILES = `${ROOT}files/`;
export type DumpFormat = 'data-dir' | 'json';
const databaseEntry = (f: DumpFormat) => `${DATABASE}${f === 'data-dir' ? 'data-dir.tar.gz' : 'dump.json'}`;

/** The database dump is held in memory while it is checked and opened. */
export const DATABASE_MAX_BYTES = 512 * 1024 * 1024;
/** Far above the largest upload (UPLOAD_MAX_MB is at most 100): each file is held in memory while it is written. */
const FILE_MAX_BYTES = 256 * 1024 * 1024;
const MANIFEST_MAX_BYTES = 64 * 1024 * 1024;

const Sha256 = z.string().regex(/^[0-9a-f]{64}$/);
const Key = z.string().regex(/^[0-9a-f]{32}$/);
const Size = z.number().int().nonnegative();
export const SchemaVersionSchema = z.object({ migrations: z.number().int().nonnegative(), lastMigrationAt: z.string().nullable() });
export type SchemaVersion = z.infer<typeof SchemaVersionSchema>;

export const ManifestSchema = z.object({
  format: z.literal(ARCHIVE_FORMAT),
  version: z.literal(1),
  createdAt: z.string(),
  driver: z.enum(['pglite', 'postgres']),
  schemaVersion: SchemaVersionSchema,
  database: z.object({ format: z.enum(['data-dir', 'json']), size: Size, sha256: Sha256 }),
  /** Every file the attachment rows name (originals and previews), as stored. */
  files: z.array(z.object({ key: Key, size: Size, sha256: Sha256, contentType: z.string().max(200) })),
  /** Named by a row but not in the store when the backup was made. */
  missing: z.array(Key),
});
export type Manifest = z.infer<typeof ManifestSchema>;

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

export interface StoredFile {
  key: string;
  contentType: string;
}
export interface ArchiveContents {
  createdAt: Date;
  driver: DbKind;
  schemaVersion: SchemaVersion;
  database: { format: DumpFormat; bytes: Buffer };
  files: StoredFile[];
  /** The file's bytes from the store, or null when nothing is stored under the key. */
  read(key: string): Promise<Buffer | null>;
}

/** Writes the archive to `out`, one file in memory at a time; answers the manifest once all is handed on. */
export async function writeArchive(c: ArchiveContents, out: Writable): Promise<Manifest> {
  const pack = tar.pack();
  const sent = pipeline(pack, createGzip(), out);
  const mtime = c.createdAt;
  const add = (name: string, bytes: Buffer) =>
    new Promise<void>((done, fail) => pack.entry({ name, size: bytes.length, mtime, mode: 0o600 }, bytes, (e) => (e ? fail(e) : done())));
  const manifest: Manifest = {
    format: ARCHIVE_FORMAT,
    version: 1,
    createdAt: c.createdAt.toISOString(),
    driver: c.driver,
    schemaVersion: c.schemaVersion,
    database: { format: c.database.format, size: c.database.bytes.length, sha256: sha256(c.database.bytes) },
    files: [],
    missing: [],
  };
  let failure: unknown;
  try {
    await add(databaseEntry(c.database.format), c.database.bytes);
    for (const f of c.files) {
      const bytes = await c.read(f.key);
      if (!bytes) {
        manifest.missing.push(f.key);
        continue;
      }
      manifest.files.push({ key: f.key, size: bytes.length, sha256: sha256(bytes), contentType: f.contentType });
      await add(`${FILES}${f.key}`, bytes);
    }
    await add(MANIFEST, Buffer.from(JSON.stringify(manifest, null, 1)));
    pack.finalize();
  } catch (e) {
    failure = e;
    pack.destroy(e as Error);
  }
  await sent.catch((e) => {
    throw failure ?? e;
  });
  if (failure) throw failure;
  return manifest;
}

/** The first bytes of the archive's first entry name: whether a gzip file is one of these archives. */
export async function isArchive(path: string): Promise<boolean> {
  let first: string | undefined;
  try {
    await eachEntry(path, async (header) => {
      first = header.name;
      throw STOP;
    });
  } catch (e) {
    if (e !== STOP) return false;
  }
  return first?.startsWith(ROOT) ?? false;
}
const STOP = Symbol('stop');

type Visit = (header: tar.Header, body: AsyncIterable<Buffer>) => Promise<void>;

/** Calls `visit` for each entry in turn; the visitor reads the entry's body to its end. */
async function eachEntry(path: string, visit: Visit) {
  const extract = tar.extract();
  const fed = pipeline(createReadStream(path), createGunzip(), extract);
  try {
    for await (const entry of extract) await visit(entry.header, entry as AsyncIterable<Buffer>);
  } catch (e) {
    extract.destroy();
    await fed.catch(() => {});
    throw e;
  }
  await fed;
}

export const damaged = (why: string) =>
  badRequest(`This backup is damaged (${why}). Nothing was changed. Make a new backup, or choose another copy of this one.`, [{ path: 'file', message: why }]);

/** Stream and archive faults are damage; refusals already in words pass through. */
const inWords = (e: unknown) => (e instanceof HttpError ? e : damaged(`it could not be read to its end: ${e instanceof Error ? e.message : String(e)}`));

async function readAll(body: AsyncIterable<Buffer>, size: number) {
  const out = Buffer.allocUnsafe(size);
  let at = 0;
  for await (const chunk of body) {
    if (at + chunk.length > size) throw damaged('an entry is longer than its header says');
    chunk.copy(out, at);
    at += chunk.length;
  }
  if (at !== size) throw damaged('an entry is shorter than its header says');
  return out;
}

async function hashAll(body: AsyncIterable<Buffer>) {
  const h = createHash('sha256');
  let size = 0;
  for await (const chunk of body) {
    h.update(chunk);
    size += chunk.length;
  }
  return { size, sha256: h.digest('hex') };
}

export interface CheckedArchive {
  manifest: Manifest;
  /** The database dump, its checksum already matched. */
  database: Buffer;
}

/**
 * Reads the whole archive once and checks it against its manifest: the database dump and every file
 * present once, each of the size and SHA-256 listed, nothing else in it. Changes nothing.
 */
export async function checkArchive(path: string): Promise<CheckedArchive> {
  const seen = new Map<string, { size: number; sha256: string }>();
  let manifestText: Buffer | undefined;
  let database: { name: string; bytes: Buffer } | undefined;
  try {
    await eachEntry(path, async (header, body) => {
      const { name } = header;
      const size = header.size ?? 0;
      if (header.type !== 'file') throw damaged(`“${name.slice(0, 80)}” is not a file`);
      if (name === MANIFEST) {
        if (manifestText) throw damaged('it has two manifests');
        if (size > MANIFEST_MAX_BYTES) throw damaged('its manifest is too large');
        manifestText = await readAll(body, size);
      } else if (name.startsWith(DATABASE)) {
        if (database) throw damaged('it has two database dumps');
        if (size > DATABASE_MAX_BYTES) throw damaged(`its database is larger than ${DATABASE_MAX_BYTES / 1024 / 1024} MB`);
        database = { name, bytes: await readAll(body, size) };
      } else if (name.startsWith(FILES)) {
        const key = name.slice(FILES.length);
        if (!Key.safeParse(key).success) throw damaged(`“${name.slice(0, 80)}” is not a stored file’s name`);
        if (seen.has(key)) throw damaged(`the file ${key} is in it twice`);
        if (size > FILE_MAX_BYTES) throw damaged(`the file ${key} is too large`);
        seen.set(key, await hashAll(body));
      } else throw damaged(`“${name.slice(0, 80)}” does not belong in a backup`);
    });
  } catch (e) {
    throw inWords(e);
  }
  if (!manifestText) throw damaged('its manifest is missing; the file may have been cut short');
  let manifest: Manifest;
  try {
    manifest = ManifestSchema.parse(JSON.parse(manifestText.toString('utf8')));
  } catch {
    throw damaged('its manifest cannot be read');
  }
  if (!database || database.name !== databaseEntry(manifest.database.format)) throw damaged('its database dump is missing');
  if (database.bytes.length !== manifest.database.size || sha256(database.bytes) !== manifest.database.sha256)
    throw damaged('the database dump does not match its checksum');
  const problems: { path: string; message: string }[] = [];
  const listed = new Set<string>();
  for (const f of manifest.files) {
    if (listed.has(f.key)) problems.push({ path: `files.${f.key}`, message: 'Listed twice.' });
    listed.add(f.key);
    const got = seen.get(f.key);
    if (!got) problems.push({ path: `files.${f.key}`, message: 'Listed in the manifest but not in the backup.' });
    else if (got.size !== f.size || got.sha256 !== f.sha256) problems.push({ path: `files.${f.key}`, message: 'Its bytes do not match the SHA-256 checksum in the manifest.' });
  }
  for (const key of seen.keys()) if (!listed.has(key)) problems.push({ path: `files.${key}`, message: 'In the backup but not in its manifest.' });
  if (problems.length) {
    const n = problems.length;
    throw badRequest(
      `This backup is damaged: ${n === 1 ? 'one stored file does' : `${n} stored files do`} not match the backup’s own list and checksums. Nothing was changed. Make a new backup, or choose another copy of this one.`,
      problems.slice(0, 50),
    );
  }
  return { manifest, database: database.bytes };
}

/** Each stored file of a checked archive with its bytes, in the archive's order, one at a time. */
export async function eachFile(path: string, manifest: Manifest, visit: (file: Manifest['files'][number], bytes: Buffer) => Promise<void>) {
  const byKey = new Map(manifest.files.map((f) => [f.key, f]));
  // The visitor's own failures (the store refusing a write) are not damage to the archive.
  let theirs: unknown = STOP;
  try {
    await eachEntry(path, async (header, body) => {
      const file = header.name.startsWith(FILES) ? byKey.get(header.name.slice(FILES.length)) : undefined;
      if (!file) {
        for await (const _ of body); // another entry: read past it
        return;
      }
      const bytes = await readAll(body, header.size ?? 0);
      // Read a second time from the temporary copy: checked again, so a fault on the way never reaches the store.
      if (sha256(bytes) !== file.sha256) throw damaged(`the file ${file.key} changed while it was read`);
      try {
        await visit(file, bytes);
      } catch (e) {
        theirs = e;
        throw e;
      }
    });
  } catch (e) {
    throw e === theirs ? e : inWords(e);
  }
}
