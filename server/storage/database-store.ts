import { Readable } from 'node:stream';
import type { Db } from '../db/client.js';
import { readUploadBytesBySha } from '../db/repositories/uploads.js';
import type { BlobStore } from './blob-store.js';

/**
 * The default: bytes stay in the upload row's bytea column, written with the row
 * itself (one statement), so `put` has nothing left to do, and `remove` neither: the
 * bytes go when the row goes.
 */
export function createDatabaseStore(db: Db): BlobStore {
  return {
    kind: 'database',
    location: 'the database (upload.bytes)',
    async check() {},
    async put() {},
    async remove() {},
    async stat(key) {
      const bytes = await readUploadBytesBySha(db, key);
      return bytes && { size: bytes.byteLength };
    },
    read: (key) => readUploadBytesBySha(db, key),
    async open(key) {
      const bytes = await readUploadBytesBySha(db, key);
      return bytes && Readable.from([Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength)]);
    },
  };
}
