import { createHash } from 'node:crypto';
import { readFile, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { BlobStore } from '../storage/types';
import type { Manifest } from './backup-archive';
import { eachFile } from './backup-archive-read';

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

export interface FilesPut {
  restored: number;
  bytes: number;
  alreadyStored: number;
  /** Puts the store back as it was before: removes what was new, rewrites what was replaced. */
  undo(): Promise<void>;
}

/**
 * Writes a checked archive's files to the store. A key already holding the same bytes is left
 * alone; a key holding other bytes keeps its old bytes aside in `workDir` until the restore is
 * settled, so `undo` can put them back.
 */
export async function putFiles(store: BlobStore, archivePath: string, manifest: Manifest, workDir: string): Promise<FilesPut> {
  const added: string[] = [];
  const replaced: { key: string; contentType: string; aside: string }[] = [];
  let bytes = 0;
  let alreadyStored = 0;
  const undo = async () => {
    // Each undone on its own: one failure does not leave the others in place.
    const results = await Promise.allSettled([
      ...added.map((key) => store.delete(key)),
      ...replaced.map(async (r) => store.put(r.key, await readFile(r.aside), r.contentType)),
    ]);
    const failed = results.filter((r) => r.status === 'rejected');
    if (failed.length) throw new Error(`${failed.length} stored files could not be put back after a failed restore`, { cause: (failed[0] as PromiseRejectedResult).reason });
  };
  try {
    await eachFile(archivePath, manifest, async (file, data) => {
      bytes += data.length;
      const before = await store.get(file.key);
      if (before && sha256(before) === file.sha256) {
        alreadyStored++;
        return;
      }
      if (before) {
        const aside = join(workDir, `replaced-${file.key}`);
        await writeFile(aside, before, { mode: 0o600 });
        replaced.push({ key: file.key, contentType: file.contentType, aside });
      } else added.push(file.key);
      await store.put(file.key, data, file.contentType);
    });
  } catch (e) {
    await undo();
    throw e;
  }
  return { restored: manifest.files.length, bytes, alreadyStored, undo };
}

/** How many of the keys have nothing in the store. */
export async function countAbsent(store: BlobStore, keys: Iterable<string>) {
  let n = 0;
  for (const key of keys) if (!(await store.get(key))) n++;
  return n;
}

/** Removes the files no record names any more; a file that cannot be removed is logged and left. */
export async function removeFiles(store: BlobStore, keys: Iterable<string>, log: (line: string, e: unknown) => void) {
  let n = 0;
  for (const key of keys) {
    try {
      await store.delete(key);
      n++;
    } catch (e) {
      log(`[backup] could not remove ${key}, which no record names after the restore`, e);
    }
  }
  return n;
}
