import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { pipeline } from 'node:stream/promises';
import { createGunzip } from 'node:zlib';
import tar from 'tar-stream';
import { HttpError, badRequest } from '../http-error';
import { DATABASE, FILES, FILE_MAX_BYTES, Key, MANIFEST, MANIFEST_MAX_BYTES, ManifestSchema, DATABASE_MAX_BYTES, ROOT, databaseEntry, sha256, type Manifest } from './backup-archive';

// Reading a backup archive (see backup-archive.ts for its layout): whether a file is one, a full
// check against its manifest, and its stored files one at a time.

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
