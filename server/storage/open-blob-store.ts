import type { Db } from '../db/client.js';
import { useBlobStore, type BlobStore } from './blob-store.js';
import { createDatabaseStore } from './database-store.js';
import type { S3Settings } from './s3-store.js';

/**
 * The configured object store, checked (throws saying what to fix when the bucket
 * cannot be used), or undefined without settings. Needs no database, so a start-up
 * with a wrong bucket fails before the database is opened. The AWS SDK is loaded
 * only when a bucket is configured.
 */
export async function openObjectStore(s3: S3Settings | undefined): Promise<BlobStore | undefined> {
  if (!s3) return undefined;
  const { createS3Store } = await import('./s3-store.js');
  const store = createS3Store(s3);
  await store.check();
  return store;
}

/** Binds the object store to `db`, or the database store when there is none; returns the one bound. */
export function bindBlobStore(db: Db, objectStore: BlobStore | undefined): BlobStore {
  const store = objectStore ?? createDatabaseStore(db);
  useBlobStore(db, store);
  return store;
}

/** {@link openObjectStore} and {@link bindBlobStore} in one step (tests, tools). */
export async function openBlobStore(db: Db, s3: S3Settings | undefined): Promise<BlobStore> {
  return bindBlobStore(db, await openObjectStore(s3));
}
