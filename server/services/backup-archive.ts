import { createHash } from 'node:crypto';
import { Readable, type Writable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { constants, createGzip } from 'node:zlib';
import tar from 'tar-stream';
import { z } from 'zod';
import type { DbKind } from '../db/client';

// One backup file, a gzipped tar: the database dump first, then every stored file, then the manifest.
// The manifest comes last so each file is read from the store once, its checksum taken on the way.
// Every entry sits under one folder; an older backup's data directory starts with the database's
// own folder name instead, which is how the two tell apart.

export const ARCHIVE_FORMAT = 'lashline-archive';
export const ROOT = 'lashline-backup/';
export const MANIFEST = `${ROOT}manifest.json`;
export const DATABASE = `${ROOT}database/`;
export const FILES = `${ROOT}files/`;
export type DumpFormat = 'data-dir' | 'json';
export const databaseEntry = (f: DumpFormat) => `${DATABASE}${f === 'data-dir' ? 'data-dir.tar.gz' : 'dump.json'}`;

/** The database dump is held in memory while it is checked and opened. */
export const DATABASE_MAX_BYTES = 512 * 1024 * 1024;
/** Far above the largest upload (UPLOAD_MAX_MB is at most 100): each file is held in memory while it is written. */
export const FILE_MAX_BYTES = 256 * 1024 * 1024;
export const MANIFEST_MAX_BYTES = 64 * 1024 * 1024;

const Sha256 = z.string().regex(/^[0-9a-f]{64}$/);
export const Key = z.string().regex(/^[0-9a-f]{32}$/);
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

export const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

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

const TAR_BLOCK = 512;

/**
 * The tar stream as two gzip members (RFC 1952, 2.2: a gzip file is a series of members; gunzip reads
 * them as one stream). The first `split` bytes, the database entry, are deflated; the rest, photos,
 * previews and PDFs that are compressed already, is stored: deflate gains nothing on them and runs at
 * about 25 MB/s on this class of machine, against about 200 MB/s stored. The split falls after the
 * entry's 512-byte ustar header and its padded body; were it off, only the compression would suffer.
 */
async function* gzipInTwo(source: tar.Pack, split: number): AsyncGenerator<Buffer> {
  const head = createGzip();
  const rest = createGzip({ level: constants.Z_NO_COMPRESSION });
  // A failure reaches the reader through the iteration below and through `feeding`; the member not
  // being read at that moment must not raise it a second time as an unheard event.
  for (const z of [head, rest]) z.on('error', () => {});
  const write = async (z: Writable, b: Buffer) => {
    if (z.destroyed) throw new Error('The backup stream was closed.');
    if (!z.write(b))
      await new Promise<void>((go) => {
        const on = () => {
          z.off('drain', on);
          z.off('close', on);
          go();
        };
        z.on('drain', on);
        z.on('close', on);
      });
  };
  let whole = false;
  const feeding = (async () => {
    let at = 0;
    for await (const chunk of source as AsyncIterable<Buffer>) {
      let c = chunk;
      if (at < split) {
        const take = Math.min(c.length, split - at);
        await write(head, c.subarray(0, take));
        at += take;
        c = c.subarray(take);
        if (at === split) head.end();
      }
      if (c.length) await write(rest, c);
    }
    if (at < split) head.end();
    rest.end();
    whole = true;
  })();
  feeding.catch((e: Error) => {
    head.destroy(e);
    rest.destroy(e);
  });
  try {
    yield* head;
    yield* rest;
    await feeding;
  } finally {
    // Stopped early (the reader went away, or a file could not be read): the tar stream stops too,
    // so whoever is adding entries hears of it.
    if (!whole && !source.destroyed) source.destroy(new Error('The backup stream was closed.'));
    head.destroy();
    rest.destroy();
  }
}

/** Writes the archive to `out`, one file in memory at a time; answers the manifest once all is handed on. */
export async function writeArchive(c: ArchiveContents, out: Writable): Promise<Manifest> {
  const pack = tar.pack();
  // Its failures reach the reading side (gzipInTwo) and the entries' callbacks; the event itself needs no one.
  pack.on('error', () => {});
  // Settled with its error, if any, from the start: it may fail while entries are still being added.
  const sent = pipeline(Readable.from(gzipInTwo(pack, TAR_BLOCK + Math.ceil(c.database.bytes.length / TAR_BLOCK) * TAR_BLOCK)), out).then(
    () => null,
    (e: unknown) => e ?? new Error('The backup stream failed.'),
  );
  const mtime = c.createdAt;
  const add = (name: string, bytes: Buffer) =>
    new Promise<void>((done, fail) => {
      const entry = pack.entry({ name, size: bytes.length, mtime, mode: 0o600 }, bytes, (e) => (e ? fail(e) : done()));
      // The callback carries the entry's failure; its own error event would otherwise go unheard.
      entry.on('error', () => {});
    });
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
  const streamError = await sent;
  if (streamError ?? failure) throw streamError ?? failure;
  return manifest;
}
