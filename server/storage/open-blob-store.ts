import type { Db } from '../db/client.js';
import { useBlobStore, type BlobStore } from './blob-store.js';
import { createDatabaseStore } from './database-store.js';
import type { S3Settings } from './s3-store.js';

/**
 * Opens the configured store, checks it can be reached, and binds it to `db`. Without
 * S3 settings the bytes stay in the database. The AWS SDK is loaded only when needed.
 */
export async function openBlobStore(db: Db, s3: S3Settings | undefined): Promise<BlobStore> {
  let store: BlobStore;
  if (s3) {
    const { createS3Store } = await import('./s3-store.js');
    store = createS3Store(s3);
  } else {
    store = createDatabaseStore(db);
  }
  await store.check();
  useBlobStore(db, store);
  return store;
}
