import { mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { BlobStore } from './types';
import { assertBlobKey, newBlobKey } from './keys';

/**
 * Files under one directory (DATA_DIR/uploads), never served directly: every read goes through
 * the API's site check. Keys are spread over 256 subdirectories so no directory grows huge.
 */
export function createDiskBlobStore(root: string): BlobStore {
  const pathOf = (key: string) => {
    assertBlobKey(key);
    return join(root, key.slice(0, 2), key);
  };
  return {
    async put(key, bytes) {
      const path = pathOf(key);
      await mkdir(join(root, key.slice(0, 2)), { recursive: true, mode: 0o700 });
      // Written aside and renamed, so a crash mid-write never leaves half a file under the key.
      const tmp = `${path}.${newBlobKey()}.part`;
      try {
        await writeFile(tmp, bytes, { mode: 0o600 });
        await rename(tmp, path);
      } catch (e) {
        await rm(tmp, { force: true });
        throw e;
      }
    },
    async get(key) {
      try {
        return await readFile(pathOf(key));
      } catch (e) {
        if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw e;
      }
    },
    async delete(key) {
      await rm(pathOf(key), { force: true });
    },
  };
}
