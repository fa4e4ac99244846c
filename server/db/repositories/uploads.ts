import { Readable } from 'node:stream';
import { and, asc, desc, eq, gt, inArray, isNotNull, sql } from 'drizzle-orm';
import { PgTransaction } from 'drizzle-orm/pg-core';
import { blobStoreOf, useBlobStore, type BlobStore } from '../../storage/blob-store.js';
import type { Db } from '../client.js';
import { notebook, notebookAccess, notebookRevision, upload, uploadLink, user, workspaceMember } from '../schema.js';

export interface UploadRecord {
  id: string;
  sha256: string;
  fileName: string;
  size: number;
  format: 'fit' | 'csv';
  workspaceId: string;
  uploadedBy: string | null;
  warnings: { code: string; message: string }[];
  createdAt: Date;
}

const metaColumns = {
  id: upload.id,
  sha256: upload.sha256,
  fileName: upload.fileName,
  size: upload.size,
  format: upload.format,
  workspaceId: upload.workspaceId,
  uploadedBy: upload.uploadedBy,
  warnings: sql<{ code: string; message: string }[]>`${upload.warnings}`,
  createdAt: upload.createdAt,
};

export async function findUpload(db: Db, id: string): Promise<UploadRecord | undefined> {
  const rows = await db.select(metaColumns).from(upload).where(eq(upload.id, id));
  return rows[0];
}

export async function findUploadBySha(db: Db, sha256: string): Promise<UploadRecord | undefined> {
  const rows = await db.select(metaColumns).from(upload).where(eq(upload.sha256, sha256));
  return rows[0];
}

/** The original bytes: from the row, or from the object store when the row holds none. */
export async function readUploadBytes(db: Db, id: string): Promise<Uint8Array | undefined> {
  const rows = await db.select({ bytes: upload.bytes, sha256: upload.sha256 }).from(upload).where(eq(upload.id, id));
  const row = rows[0];
  if (!row) return undefined;
  return row.bytes ?? (await externalStore(db, row.sha256).read(row.sha256));
}

/** Like {@link readUploadBytes}, as a stream (downloads need not hold the file in memory). */
export async function openUploadBytes(db: Db, id: string): Promise<Readable | undefined> {
  const rows = await db.select({ bytes: upload.bytes, sha256: upload.sha256 }).from(upload).where(eq(upload.id, id));
  const row = rows[0];
  if (!row) return undefined;
  if (row.bytes) return Readable.from([Buffer.from(row.bytes.buffer, row.bytes.byteOffset, row.bytes.byteLength)]);
  return externalStore(db, row.sha256).open(row.sha256);
}

/** Bytes kept in the row itself (the database store). */
export async function readUploadBytesBySha(db: Db, sha256: string): Promise<Uint8Array | undefined> {
  const rows = await db.select({ bytes: upload.bytes }).from(upload).where(eq(upload.sha256, sha256));
  return rows[0]?.bytes ?? undefined;
}

function externalStore(db: Db, sha256: string) {
  const store = blobStoreOf(db);
  if (!store) {
    throw new Error(`upload ${sha256} is kept in an object store, but none is configured: set COGBOOK_S3_BUCKET (and its endpoint) as when it was uploaded`);
  }
  return store;
}

type StoreUploadInput = {
  sha256: string;
  fileName: string;
  format: 'fit' | 'csv';
  bytes: Uint8Array;
  warnings: { code: string; message: string }[];
  uploadedBy: string;
  workspaceId: string;
};

/** One upload as stored: its row, and whether the row was there already (same bytes). */
export interface StoredUpload {
  record: UploadRecord;
  duplicate: boolean;
}

/**
 * Stores bytes once per sha256 and links them to the workspace, all or nothing: the
 * upload row and its workspace link are written in one transaction. Two concurrent
 * uploads of the same bytes both end with the one row (the unique sha256 decides).
 * Takes the database handle itself, never a transaction: to store uploads together
 * with other rows use {@link storeUploadsWith}.
 */
export async function storeUpload(db: Db, input: StoreUploadInput): Promise<StoredUpload> {
  return storeUploadsWith(db, [input], async (_tx, [stored]) => stored!);
}

/**
 * Stores several uploads as {@link storeUpload} does, and the rows `alsoWrite` writes
 * with the transaction it is given, in one transaction: when anything fails nothing is
 * kept (e.g. an imported notebook and its recordings). `stored` follows `inputs`.
 *
 * With an object store the bytes go there first, so no row ever points at missing
 * bytes; when the transaction then fails, each object this call put is removed again
 * unless a row for the same bytes exists by then. Every upload of the same bytes takes
 * the same advisory lock inside its transaction and the removal takes it too, so a
 * removal cannot pull the object from under another upload's new row: a new row is
 * written only after checking, under the lock, that its object is there. The locks are
 * taken in sha256 order, so two calls storing the same files cannot deadlock. The
 * store is bound to the transaction as well, so `alsoWrite` reads uploads as `db` does.
 */
export async function storeUploadsWith<T>(
  db: Db,
  inputs: readonly StoreUploadInput[],
  alsoWrite: (tx: Db, stored: StoredUpload[]) => Promise<T>,
): Promise<T> {
  if (db instanceof PgTransaction) {
    // The object store is bound to the database handle, not to transactions opened on it:
    // from here the bytes would silently land in the database instead of the bucket.
    throw new Error('uploads are stored with the database handle, not inside a transaction: write the other rows through storeUploadsWith');
  }
  const store = blobStoreOf(db);
  const shas = [...new Set(inputs.map((i) => i.sha256))].sort();
  const put: string[] = [];
  try {
    if (store) {
      for (const sha256 of shas) {
        if (await findUploadBySha(db, sha256)) continue;
        await store.put(sha256, inputs.find((i) => i.sha256 === sha256)!.bytes);
        put.push(sha256);
      }
    }
    return await db.transaction(async (tx) => {
      if (store) {
        useBlobStore(tx, store);
        for (const sha256 of shas) await lockBytes(tx, sha256);
      }
      const stored: StoredUpload[] = [];
      for (const input of inputs) stored.push(await writeUploadRow(tx, store, input));
      return alsoWrite(tx, stored);
    });
  } catch (error) {
    if (store) for (const sha256 of put) await removeUnusedObject(db, store, sha256, error);
    throw error;
  }
}

/** The upload row (unless one holds these bytes already) and its workspace link; with a store, under the bytes' lock. */
async function writeUploadRow(tx: Db, store: BlobStore | undefined, input: StoreUploadInput): Promise<StoredUpload> {
  const inserted = await tx
    .insert(upload)
    .values({
      sha256: input.sha256,
      fileName: input.fileName,
      size: input.bytes.byteLength,
      format: input.format,
      bytes: store ? null : input.bytes,
      warnings: input.warnings,
      uploadedBy: input.uploadedBy,
      workspaceId: input.workspaceId,
    })
    .onConflictDoNothing({ target: upload.sha256 })
    .returning(metaColumns);
  // A new row needs its object: another upload of the same bytes whose transaction failed
  // may have removed it between our put and our lock (a rare race; put it again).
  if (store && inserted.length > 0 && (await store.stat(input.sha256))?.size !== input.bytes.byteLength) {
    await store.put(input.sha256, input.bytes);
  }
  const record = inserted[0] ?? (await findUploadBySha(tx, input.sha256));
  if (!record) throw new Error(`upload ${input.sha256} vanished right after it was stored`);
  await tx
    .insert(uploadLink)
    .values({ uploadId: record.id, workspaceId: input.workspaceId, uploadedBy: input.uploadedBy })
    .onConflictDoNothing();
  return { record, duplicate: inserted.length === 0 };
}

/** Serialises writers of one sha256 (uploads, orphan removal) until the transaction ends. */
async function lockBytes(tx: Db, sha256: string): Promise<void> {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${`cogbook.upload:${sha256}`}, 0))`);
}

/**
 * After a failed upload: removes the object it put, unless a row for the same bytes
 * exists (another upload's, committed meanwhile). A removal that fails leaves an object
 * no row names, which is harmless (the next upload of these bytes overwrites it); the
 * upload's own error is what the caller sees, with the removal's failure added.
 */
async function removeUnusedObject(db: Db, store: BlobStore, sha256: string, cause: unknown): Promise<void> {
  try {
    await db.transaction(async (tx) => {
      await lockBytes(tx, sha256);
      const rows = await tx.select({ id: upload.id }).from(upload).where(eq(upload.sha256, sha256));
      if (rows.length === 0) await store.remove(sha256);
    });
  } catch (removal) {
    if (cause instanceof Error) {
      cause.message += `; the object it put in ${store.location} is left unused (${removal instanceof Error ? removal.message : String(removal)})`;
    }
  }
}

/**
 * True when the user may read the upload: a member of a workspace that uploaded it,
 * or someone who can read a notebook (by membership or grant) whose history binds it.
 */
export async function userCanSeeUpload(db: Db, uploadId: string, userId: string): Promise<boolean> {
  const viaWorkspace = await db
    .select({ one: sql<number>`1` })
    .from(uploadLink)
    .innerJoin(workspaceMember, eq(workspaceMember.workspaceId, uploadLink.workspaceId))
    .where(and(eq(uploadLink.uploadId, uploadId), eq(workspaceMember.userId, userId)))
    .limit(1);
  if (viaWorkspace.length > 0) return true;
  const pattern = JSON.stringify([{ uploadId }]);
  const viaNotebook = await db
    .select({ one: sql<number>`1` })
    .from(notebookRevision)
    .innerJoin(notebook, eq(notebook.id, notebookRevision.notebookId))
    .leftJoin(workspaceMember, and(eq(workspaceMember.workspaceId, notebook.workspaceId), eq(workspaceMember.userId, userId)))
    .leftJoin(notebookAccess, and(eq(notebookAccess.notebookId, notebook.id), eq(notebookAccess.userId, userId)))
    .where(
      and(
        sql`${notebookRevision.document} -> 'slots' @> ${pattern}::jsonb`,
        sql`(${workspaceMember.role} is not null or ${notebookAccess.role} is not null)`,
      ),
    )
    .limit(1);
  return viaNotebook.length > 0;
}

/** One workspace's link to an upload, with the upload's metadata and who linked it. */
export interface WorkspaceUploadRecord extends UploadRecord {
  linkedAt: Date;
  linkedBy: { id: string; name: string } | null;
}

/** A page of a workspace's uploads, newest link first, and how many there are in all. */
export async function listWorkspaceUploads(db: Db, workspaceId: string, page: { limit: number; offset: number }): Promise<{ rows: WorkspaceUploadRecord[]; total: number }> {
  const rows = await db
    .select({ ...metaColumns, linkedAt: uploadLink.createdAt, linkedById: user.id, linkedByName: user.name })
    .from(uploadLink)
    .innerJoin(upload, eq(upload.id, uploadLink.uploadId))
    .leftJoin(user, eq(user.id, uploadLink.uploadedBy))
    .where(eq(uploadLink.workspaceId, workspaceId))
    .orderBy(desc(uploadLink.createdAt), desc(upload.id))
    .limit(page.limit)
    .offset(page.offset);
  const [counted] = await db.select({ n: sql<number>`count(*)::int` }).from(uploadLink).where(eq(uploadLink.workspaceId, workspaceId));
  return {
    rows: rows.map(({ linkedById, linkedByName, ...r }) => ({ ...r, linkedBy: linkedById && linkedByName !== null ? { id: linkedById, name: linkedByName } : null })),
    total: Number(counted?.n ?? 0),
  };
}

/** Metadata of several uploads at once (ids not found are left out). */
export async function findUploads(db: Db, ids: readonly string[]): Promise<UploadRecord[]> {
  if (ids.length === 0) return [];
  return db.select(metaColumns).from(upload).where(inArray(upload.id, [...ids]));
}

/** An upload whose bytes are still in its row, without the bytes. */
export interface HeldUpload {
  id: string;
  sha256: string;
  fileName: string;
  size: number;
}

/** Uploads whose bytes are still in the database, by id after `afterId` (a page for moving them out). */
export async function listUploadsHeldInDatabase(db: Db, afterId: string, limit: number): Promise<HeldUpload[]> {
  return db
    .select({ id: upload.id, sha256: upload.sha256, fileName: upload.fileName, size: upload.size })
    .from(upload)
    .where(and(isNotNull(upload.bytes), gt(upload.id, afterId)))
    .orderBy(asc(upload.id))
    .limit(limit);
}

/** How many uploads keep their bytes in the database and how many elsewhere, with the bytes of each. */
export async function countUploadsByHome(db: Db): Promise<{ inDatabase: number; inDatabaseBytes: number; elsewhere: number; elsewhereBytes: number }> {
  const [row] = await db
    .select({
      inDatabase: sql<number>`count(*) filter (where ${upload.bytes} is not null)::int`,
      inDatabaseBytes: sql<number>`coalesce(sum(${upload.size}) filter (where ${upload.bytes} is not null), 0)::float8`,
      elsewhere: sql<number>`count(*) filter (where ${upload.bytes} is null)::int`,
      elsewhereBytes: sql<number>`coalesce(sum(${upload.size}) filter (where ${upload.bytes} is null), 0)::float8`,
    })
    .from(upload);
  return {
    inDatabase: Number(row?.inDatabase ?? 0),
    inDatabaseBytes: Number(row?.inDatabaseBytes ?? 0),
    elsewhere: Number(row?.elsewhere ?? 0),
    elsewhereBytes: Number(row?.elsewhereBytes ?? 0),
  };
}

/** The bytes kept in the upload's own row (none when they live in an object store). */
export async function readHeldUploadBytes(db: Db, id: string): Promise<Uint8Array | undefined> {
  const rows = await db.select({ bytes: upload.bytes }).from(upload).where(eq(upload.id, id));
  return rows[0]?.bytes ?? undefined;
}

/**
 * Drops the database copy of an upload's bytes once they are safely in the object
 * store; answers false when the row is gone or holds no bytes any more.
 */
export async function clearHeldUploadBytes(db: Db, id: string, sha256: string): Promise<boolean> {
  const cleared = await db
    .update(upload)
    .set({ bytes: null })
    .where(and(eq(upload.id, id), eq(upload.sha256, sha256), isNotNull(upload.bytes)))
    .returning({ id: upload.id });
  return cleared.length > 0;
}
