/** Where uploaded files live: the bytes only. What they are and who may see them is in the database. */
export interface BlobStore {
  /** Writes the bytes under the key, replacing anything already there. */
  put(key: string, bytes: Buffer, contentType: string): Promise<void>;
  /** The bytes under the key, or null when nothing is stored there. */
  get(key: string): Promise<Buffer | null>;
  /** Removes the key; removing a key that is not there is not an error. */
  delete(key: string): Promise<void>;
}
