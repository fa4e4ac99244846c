import { createHash } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import type { NotebookDocument } from '../../shared/notebook/document.js';
import { UsageError } from './compare-args.js';

/** A recording as the recipe command hands it to the engine. */
export interface RecipeFile {
  slot: string;
  fileName: string;
  bytes: Uint8Array;
}

/** The notebook to compute and the recordings it carries or binds. */
export interface RecipeSource {
  document: NotebookDocument;
  revision: number;
  /** Where it came from, for the output. */
  origin: { kind: 'file'; path: string } | { kind: 'database'; id: string };
  /** Recordings embedded in the export file, or bound in the database, by slot. */
  bound: RecipeFile[];
}

/** True when `notebook` names a file (an export) rather than a database id. */
export function isExportPath(notebook: string): boolean {
  return existsSync(notebook) || /\.json$/i.test(notebook) || notebook.includes('/');
}

/** Reads an export file: no server and no database are involved. */
export async function loadExportFile(path: string): Promise<RecipeSource> {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new UsageError(`${path}: ${code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : 'cannot be read'}`);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    throw new UsageError(`${path}: not a Cogbook export (not valid JSON: ${(error as Error).message})`);
  }
  const { readNotebookExport } = await import('../../shared/notebook/export-format.js');
  const { isEngineError } = await import('../../shared/errors.js');
  try {
    const read = readNotebookExport(json);
    const bound = read.recordings.map((r) => {
      const bytes = new Uint8Array(Buffer.from(r.base64, 'base64'));
      if (createHash('sha256').update(bytes).digest('hex') !== r.sha256) throw new UsageError(`${path}: the recording ${r.fileName} (slot ${r.slot}) does not match its sha256; the file is damaged`);
      return { slot: r.slot, fileName: r.fileName, bytes };
    });
    const revision = (json as { source?: { revision?: number } }).source?.revision ?? 1;
    return { document: read.document, revision, origin: { kind: 'file', path }, bound };
  } catch (error) {
    if (isEngineError(error)) throw new UsageError(`${path}: ${error.message}`);
    throw error;
  }
}

/**
 * Reads a notebook's current revision and its bound recordings from the database:
 * DATABASE_URL, else the PGlite folder in DATA_DIR. A running server holds that
 * folder's lock, and PGlite must never be opened by two processes: then refuse.
 */
export async function loadFromDatabase(id: string, env: NodeJS.ProcessEnv): Promise<RecipeSource> {
  const { openDatabase, pgliteDirOf } = await import('../db/client.js');
  const { acquireDataDirLock, DataDirLockedError } = await import('../db/data-lock.js');
  const databaseUrl = env['DATABASE_URL'] || undefined;
  const dataDir = resolve(env['DATA_DIR'] || './data');
  let lock: { release(): void } | undefined;
  if (!databaseUrl) {
    if (!existsSync(pgliteDirOf(dataDir))) throw new UsageError(`no Cogbook database in ${dataDir} (set DATA_DIR or DATABASE_URL, or pass an export file)`);
    try {
      lock = acquireDataDirLock(dataDir);
    } catch (error) {
      if (error instanceof DataDirLockedError) {
        throw new UsageError(`a Cogbook server is using ${dataDir}; export the notebook (GET /api/notebooks/${id}/export?recordings=1) and pass the file instead`);
      }
      throw error;
    }
  }
  try {
    const database = await openDatabase({ databaseUrl, pgliteDir: databaseUrl ? undefined : pgliteDirOf(dataDir) });
    try {
      const { findNotebookForUser, findRevisionDocument } = await import('../db/repositories/notebooks.js');
      const { findUpload, readUploadBytes } = await import('../db/repositories/uploads.js');
      const { migrateNotebookDocument } = await import('../../shared/notebook/migrate-document.js');
      // No user: the command runs with the database owner's rights; the user id matches nobody.
      const nb = await findNotebookForUser(database.db, id, '');
      if (!nb) throw new UsageError(`no notebook with id ${id} in the database`);
      const rev = await findRevisionDocument(database.db, id, nb.currentRevision);
      if (!rev) throw new Error(`notebook ${id} has no row for its revision ${nb.currentRevision}`);
      const document = migrateNotebookDocument(rev.document);
      const bound: RecipeFile[] = [];
      for (const slot of document.slots) {
        if (!slot.uploadId) continue;
        const meta = await findUpload(database.db, slot.uploadId);
        const bytes = await readUploadBytes(database.db, slot.uploadId);
        if (meta && bytes) bound.push({ slot: slot.name, fileName: meta.fileName, bytes: bytes.slice() });
      }
      return { document, revision: nb.currentRevision, origin: { kind: 'database', id }, bound };
    } finally {
      await database.close();
    }
  } finally {
    lock?.release();
  }
}
