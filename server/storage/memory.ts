import type { BlobStore } from './types';
import { assertBlobKey } from './keys';

/** Keeps files in the process: for tests, and for an app built without a configured store. */
export function createMemoryBlobStore(): BlobStore & { readonly size: number } {
  const blobs = new Map<string, Buffer>();
  return {
    async put(key, bytes) {
      assertBlobKey(key);
      blobs.set(key, Buffer.from(bytes));
    },
    async get(key) {
      assertBlobKey(key);
      const b = blobs.get(key);
      return b ? Buffer.from(b) : null;
    },
    async delete(key) {
      assertBlobKey(key);
      blobs.delete(key);
    },
    get size() {
      return blobs.size;
    },
  };
}
