import type { Readable } from 'node:stream';

/**
 * Where uploads' original bytes live, keyed by their sha256. The upload row always
 * keeps the metadata; with the default database store it keeps the bytes too.
 */
export interface BlobStore {
  /** 'database': bytes in the upload row (bytea); 's3': an S3-compatible bucket. */
  readonly kind: 'database' | 's3';
  /** Where, for start-up lines and error messages (never credentials). */
  readonly location: string;
  /** Throws an error saying what to fix when the store cannot be used. */
  check(): Promise<void>;
  /** Stores bytes under their key; storing the same key again is harmless. */
  put(key: string, bytes: Uint8Array): Promise<void>;
  /** The whole object, or undefined when the key is unknown. */
  read(key: string): Promise<Uint8Array | undefined>;
  /** The object as a stream (downloads), or undefined when the key is unknown. */
  open(key: string): Promise<Readable | undefined>;
  /** The object's size in bytes, or undefined when the key is unknown (no bytes are fetched). */
  stat(key: string): Promise<{ size: number } | undefined>;
  /** Removes the object; removing an unknown key is harmless. */
  remove(key: string): Promise<void>;
}

// Repositories are called with the Drizzle handle alone (from services, the run
// worker's caller and the CLI alike), so the store travels with that handle.
const stores = new WeakMap<object, BlobStore>();

/** Makes `store` the home of new uploads' bytes for everything that uses `db`. */
export function useBlobStore(db: object, store: BlobStore): void {
  stores.set(db, store);
}

/** The store bound to `db`, or undefined when the bytes stay in the database. */
export function blobStoreOf(db: object): BlobStore | undefined {
  const store = stores.get(db);
  return store?.kind === 'database' ? undefined : store;
}
