import { createHash } from 'node:crypto';
import type { Db } from '../db/client.js';
import { clearHeldUploadBytes, countUploadsByHome, listUploadsHeldInDatabase, readHeldUploadBytes, type HeldUpload } from '../db/repositories/uploads.js';
import type { BlobStore } from './blob-store.js';

/** What a move did; `before` and `after` are counts of uploads by where their bytes live. */
export interface MoveReport {
  before: { inDatabase: number; inDatabaseBytes: number; inBucket: number };
  /** Put in the bucket, read back and checked, database copy cleared (with a dry run: would be put). */
  moved: number;
  movedBytes: number;
  /** Already in the bucket with the right size and sha256 (an earlier, interrupted run): only the database copy was cleared. */
  alreadyThere: number;
  /** Left in the database, each with the reason. */
  failed: { id: string; fileName: string; reason: string }[];
  /** Set when the run stopped early because the bucket did not answer. */
  stoppedBy: string | undefined;
  after: { inDatabase: number; inBucket: number };
}

export interface MoveOptions {
  /** Count and check only: put nothing, clear nothing. */
  dryRun?: boolean;
  /** Called after each upload (progress lines); `reason` comes with 'failed'. */
  onUpload?: (upload: HeldUpload, outcome: 'moved' | 'already-there' | 'failed' | 'would-move', reason?: string) => void;
}

const PAGE = 50;

/**
 * Moves uploads' bytes from their database rows into an object store, one upload at a
 * time: put under the sha256, read back and compare size and sha256, and only then clear
 * the row's copy. Idempotent and resumable: a run stopped anywhere leaves each upload
 * either in the database (perhaps with a checked object already in the bucket, which the
 * next run finds and does not send again) or in the bucket, never in neither. An upload
 * whose database copy does not match its own sha256 is left alone and reported.
 */
export async function moveUploadsToBucket(db: Db, store: BlobStore, options: MoveOptions = {}): Promise<MoveReport> {
  if (store.kind !== 's3') throw new Error('moving uploads needs an object store (COGBOOK_S3_BUCKET)');
  const counted = await countUploadsByHome(db);
  const report: MoveReport = {
    before: { inDatabase: counted.inDatabase, inDatabaseBytes: counted.inDatabaseBytes, inBucket: counted.elsewhere },
    moved: 0,
    movedBytes: 0,
    alreadyThere: 0,
    failed: [],
    stoppedBy: undefined,
    after: { inDatabase: counted.inDatabase, inBucket: counted.elsewhere },
  };
  let afterId = '';
  pages: for (;;) {
    const page = await listUploadsHeldInDatabase(db, afterId, PAGE);
    if (page.length === 0) break;
    afterId = page.at(-1)!.id;
    for (const held of page) {
      const fail = (reason: string) => {
        report.failed.push({ id: held.id, fileName: held.fileName, reason });
        options.onUpload?.(held, 'failed', reason);
      };
      const done = (there: boolean) => {
        if (there) report.alreadyThere++;
        else {
          report.moved++;
          report.movedBytes += held.size;
        }
        options.onUpload?.(held, there ? 'already-there' : options.dryRun ? 'would-move' : 'moved');
      };
      const bytes = await readHeldUploadBytes(db, held.id);
      if (!bytes) continue; // moved meanwhile by someone else
      const sha256 = sha256Of(bytes);
      if (sha256 !== held.sha256 || bytes.byteLength !== held.size) {
        fail(`its database copy (${bytes.byteLength} bytes, sha256 ${sha256.slice(0, 12)}…) does not match the upload (${held.size} bytes, sha256 ${held.sha256.slice(0, 12)}…)`);
        continue;
      }
      try {
        const there = await holds(store, held);
        if (options.dryRun) {
          done(there);
          continue;
        }
        if (!there) {
          await store.put(held.sha256, bytes);
          if (!(await holds(store, held))) {
            fail('the bucket’s copy, read back after the put, does not match its size and sha256');
            continue;
          }
        }
        // Cleared only now: until here a stop leaves the database copy in place.
        if (await clearHeldUploadBytes(db, held.id, held.sha256)) done(there);
      } catch (error) {
        // A bucket (or database) that does not answer would fail every upload alike: stop and say so.
        report.stoppedBy = error instanceof Error ? error.message : String(error);
        fail(report.stoppedBy);
        break pages;
      }
    }
  }
  const end = await countUploadsByHome(db);
  report.after = { inDatabase: end.inDatabase, inBucket: end.elsewhere };
  return report;
}

/** True when the store holds the upload's object whole: same size, then same sha256 over its bytes. */
async function holds(store: BlobStore, held: HeldUpload): Promise<boolean> {
  const stat = await store.stat(held.sha256);
  if (stat?.size !== held.size) return false;
  const stored = await store.read(held.sha256);
  return stored !== undefined && stored.byteLength === held.size && sha256Of(stored) === held.sha256;
}

function sha256Of(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}
