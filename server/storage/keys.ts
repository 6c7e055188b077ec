import { randomBytes } from 'node:crypto';

// 128 random bits as hex: unguessable, and safe as a file name and as an object key.
const KEY_PATTERN = /^[0-9a-f]{32}$/;

export const newBlobKey = () => randomBytes(16).toString('hex');

/** Stores refuse keys they did not make, so a key can never name a path outside the store. */
export function assertBlobKey(key: string) {
  if (!KEY_PATTERN.test(key)) throw new Error(`Not a blob key: ${JSON.stringify(key.slice(0, 40))}`);
}
