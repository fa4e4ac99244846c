import type { Snapshot, SnapshotInput } from '../../shared/api/snapshots.js';
import type { NotebookDocument } from '../../shared/notebook/document.js';
import { migrateNotebookDocument } from '../../shared/notebook/migrate-document.js';
import type { Db } from '../db/client.js';
import type { RunBindingRecord } from '../db/repositories/runs.js';
import { findRevisionDocument } from '../db/repositories/notebooks.js';
import { findUpload, readUploadBytes, userCanSeeUpload } from '../db/repositories/uploads.js';
import type { ComputeInput } from '../engine/compute-notebook.js';
import { computeInWorker } from '../engine/run-in-worker.js';
import { AppError, notFound } from '../errors.js';

/** What a headless computation was asked to compute and what it read. */
export interface ComputedSnapshot {
  snapshot: Snapshot;
  bindings: RunBindingRecord[];
  csv?: string | null;
}

/** A notebook revision's document, read through the migration so older formats work. */
export async function revisionDocument(db: Db, notebookId: string, revision: number): Promise<NotebookDocument> {
  const rev = await findRevisionDocument(db, notebookId, revision);
  if (!rev) throw notFound(`Revision ${revision}`);
  return migrateNotebookDocument(rev.document);
}

/**
 * Works out which upload each slot reads: the given overrides (each must name a slot
 * of the document and an upload the caller may read), else the slot's own binding.
 */
export async function resolveBindings(
  db: Db,
  document: NotebookDocument,
  overrides: Record<string, string>,
  userId: string | null,
): Promise<{ slot: string; uploadId: string }[]> {
  const names = new Set(document.slots.map((s) => s.name));
  for (const slot of Object.keys(overrides)) {
    if (!names.has(slot)) {
      const known = [...names].join(', ') || 'none';
      throw new AppError(400, 'unknown_slot', `The notebook has no input slot "${slot}" (its slots: ${known}).`, { slot });
    }
  }
  const out: { slot: string; uploadId: string }[] = [];
  for (const s of document.slots) {
    const uploadId = overrides[s.name] ?? s.uploadId;
    if (!uploadId) continue;
    if (overrides[s.name] !== undefined && (userId === null || !(await userCanSeeUpload(db, uploadId, userId)))) throw notFound('Upload');
    out.push({ slot: s.name, uploadId });
  }
  return out;
}

/**
 * Computes a snapshot of `document` on the bound uploads in a worker thread. A file the
 * importer refuses answers 400 `input_unreadable` naming the file and slot.
 */
export async function computeSnapshot(
  db: Db,
  document: NotebookDocument,
  revision: number,
  bindings: { slot: string; uploadId: string }[],
  options: { csvCellId?: string; drawCharts?: boolean } = {},
): Promise<ComputedSnapshot> {
  const inputs: ComputeInput[] = [];
  const records: RunBindingRecord[] = [];
  for (const b of bindings) {
    const meta = await findUpload(db, b.uploadId);
    const bytes = meta ? await readUploadBytes(db, b.uploadId) : undefined;
    if (!meta || !bytes) throw notFound('Upload');
    const label = document.slots.find((s) => s.name === b.slot)?.label ?? b.slot;
    const input: SnapshotInput = { slot: b.slot, label, fileName: meta.fileName, format: meta.format, sha256: meta.sha256, size: meta.size };
    inputs.push({ ...input, bytes });
    records.push({ slot: b.slot, uploadId: b.uploadId, fileName: meta.fileName });
  }
  const outcome = await computeInWorker({ document, revision, inputs, ...(options.csvCellId ? { csvCellId: options.csvCellId } : {}), ...(options.drawCharts ? { drawCharts: true } : {}) });
  if (!outcome.ok) {
    if (outcome.error.code === 'time_limit') throw new AppError(503, 'time_limit', outcome.error.message);
    if (outcome.error.code === 'engine_failed') throw new Error(`notebook computation failed: ${outcome.error.message}`);
    throw new AppError(400, 'input_unreadable', `Slot "${outcome.error.slot}" cannot be read: ${outcome.error.message}`, {
      slot: outcome.error.slot,
      file: outcome.error.file,
      reason: outcome.error.code,
    });
  }
  return { snapshot: outcome.snapshot, bindings: records, ...(outcome.csv !== undefined ? { csv: outcome.csv } : {}) };
}
