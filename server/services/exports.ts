import { createHash } from 'node:crypto';
import type { ImportResponse } from '../../shared/api/exports.js';
import { isEngineError } from '../../shared/errors.js';
import type { NotebookDocument } from '../../shared/notebook/document.js';
import { buildNotebookExport, readNotebookExport, type ExportedRecording, type NotebookExport } from '../../shared/notebook/export-format.js';
import { sniffRecordingBytes } from '../../shared/recording/sniff.js';
import type { Db } from '../db/client.js';
import { findNotebookForUser, insertNotebook } from '../db/repositories/notebooks.js';
import { findUpload, readUploadBytes, storeUploadsWith, userCanSeeUpload } from '../db/repositories/uploads.js';
import { findRole } from '../db/repositories/workspaces.js';
import { AppError } from '../errors.js';
import { getNotebook } from './notebooks.js';
import { assertNotebook, assertWorkspace } from './policy.js';
import { revisionDocument } from './snapshot.js';
import { assertStorableJson } from './storable-json.js';

/** The export file of a notebook's current revision; recordings only those the caller may read. */
export async function exportNotebook(
  db: Db,
  userId: string,
  notebookId: string,
  withRecordings: boolean,
): Promise<{ fileName: string; file: NotebookExport; omitted: number }> {
  const nb = await findNotebookForUser(db, notebookId, userId);
  assertNotebook(nb, 'read');
  const document = await revisionDocument(db, notebookId, nb!.currentRevision);
  const recordings: ExportedRecording[] = [];
  let omitted = 0;
  if (withRecordings) {
    for (const slot of document.slots) {
      if (!slot.uploadId) continue;
      const meta = await findUpload(db, slot.uploadId);
      const bytes = meta && (await userCanSeeUpload(db, slot.uploadId, userId)) ? await readUploadBytes(db, slot.uploadId) : undefined;
      if (!meta || !bytes) {
        omitted++;
        continue;
      }
      const base64 = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('base64');
      recordings.push({ slot: slot.name, fileName: meta.fileName, format: meta.format, size: bytes.byteLength, sha256: meta.sha256, base64 });
    }
  }
  const file = buildNotebookExport(document, {
    exportedAt: new Date().toISOString(),
    source: { title: nb!.title, revision: nb!.currentRevision },
    recordings,
  });
  return { fileName: `${fileNameOf(nb!.title)}.cogbook.json`, file, omitted };
}

/** Text of an uploaded export file, parsed; a file that is not JSON answers 400 like any damaged file. */
export function parseExportText(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch (error) {
    throw new AppError(400, 'import_invalid', `The file is not a Cogbook export: it is not valid JSON (${(error as Error).message}).`);
  }
}

/**
 * Imports an export file as a new notebook in `workspaceId`. Every check (envelope,
 * version, document, each recording's base64, size, sha256 and content) passes before
 * anything is written; the uploads and the notebook are then written in one
 * transaction, so a failure leaves nothing half-imported. With an object store the
 * recordings' bytes go to it like any upload's, and a failed import removes the
 * objects it put (unless another upload's row needs them).
 */
export async function importNotebook(db: Db, userId: string, workspaceId: string, input: unknown): Promise<ImportResponse> {
  assertWorkspace(await findRole(db, workspaceId, userId), 'create');
  let read;
  try {
    read = readNotebookExport(input);
  } catch (error) {
    if (isEngineError(error)) throw new AppError(400, error.code, `Import refused: ${error.message}.`);
    throw error;
  }
  const recordings = read.recordings.map((r, i) => checkRecording(r, i));
  const document: NotebookDocument = {
    ...read.document,
    slots: await Promise.all(
      read.document.slots.map(async (s) => {
        if (recordings.some((r) => r.slot === s.name)) return s;
        // An id from another server means nothing here; keep it only when it names a file the caller may read.
        const keep = s.uploadId !== null && (await userCanSeeUpload(db, s.uploadId, userId));
        return { ...s, uploadId: keep ? s.uploadId : null };
      }),
    ),
  };
  assertStorableJson(document, 'notebook');
  const uploads = recordings.map((r) => ({ sha256: r.sha256, fileName: r.fileName, format: r.format, bytes: r.bytes, warnings: r.warnings, uploadedBy: userId, workspaceId }));
  // The recordings' uploads and the notebook in one transaction, with a bucket the objects put first
  // and removed again when it fails (the same rules as any upload).
  const { notebookId, imported } = await storeUploadsWith(db, uploads, async (tx, stored) => {
    const bound = new Map(recordings.map((r, i) => [r.slot, stored[i]!.record.id]));
    const doc = { ...document, slots: document.slots.map((s) => (bound.has(s.name) ? { ...s, uploadId: bound.get(s.name)! } : s)) };
    const id = await insertNotebook(tx, { workspaceId, ownerId: userId, title: doc.title, document: doc, summary: 'Imported from a Cogbook export file' });
    return {
      notebookId: id,
      imported: recordings.map((r, i) => ({ slot: r.slot, uploadId: stored[i]!.record.id, fileName: stored[i]!.record.fileName, duplicate: stored[i]!.duplicate })),
    };
  });
  return { ...(await getNotebook(db, userId, notebookId)), imported: { recordings: imported } };
}

function checkRecording(r: ExportedRecording, i: number) {
  const where = `recordings.${i} (${r.fileName}, slot "${r.slot}")`;
  const bytes = new Uint8Array(Buffer.from(r.base64, 'base64'));
  if (bytes.byteLength !== r.size) {
    throw new AppError(400, 'import_invalid', `Import refused: ${where} decodes to ${bytes.byteLength} bytes, but the file says ${r.size}; the file is damaged.`);
  }
  const sha256 = createHash('sha256').update(bytes).digest('hex');
  if (sha256 !== r.sha256) throw new AppError(400, 'import_invalid', `Import refused: ${where} does not match its sha256; the file is damaged.`);
  let sniff;
  try {
    sniff = sniffRecordingBytes(bytes, r.fileName);
  } catch (error) {
    if (isEngineError(error)) throw new AppError(400, 'import_invalid', `Import refused: ${where} is not a usable recording: ${error.message}`);
    throw error;
  }
  return {
    slot: r.slot,
    sha256,
    fileName: r.fileName,
    format: sniff.format,
    bytes,
    warnings: sniff.warnings.map((w) => ({ code: w.code, message: w.message })),
  };
}

function fileNameOf(title: string): string {
  return title.replace(/[^\w .()-]+/g, '_').trim().slice(0, 80) || 'notebook';
}
