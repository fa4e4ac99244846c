import { z } from 'zod';
import { EngineError } from '../errors.js';
import type { NotebookDocument } from './document.js';
import { migrateNotebookDocument } from './migrate-document.js';

/**
 * Cogbook's own export file: one JSON object that carries a notebook document and,
 * optionally, the recordings bound to its slots, so it opens on another server or in
 * the headless recipe command with nothing else.
 *
 * ```json
 * {
 *   "format": "cogbook-notebook",
 *   "formatVersion": 1,
 *   "exportedAt": "2026-03-01T09:00:00.000Z",
 *   "source": { "title": "Spider vs pedals", "revision": 7 },
 *   "notebook": { "schemaVersion": 2, "title": "...", "slots": [...], "cells": [...] },
 *   "recordings": [
 *     { "slot": "reference", "fileName": "ref.fit", "format": "fit", "size": 48213,
 *       "sha256": "<64 hex>", "base64": "<the file's bytes>" }
 *   ]
 * }
 * ```
 *
 * - `formatVersion` counts changes of this envelope; readers refuse a larger number
 *   than they know (`export_too_new`) rather than guess.
 * - `notebook` is a notebook document of any schemaVersion this Cogbook reads; it is
 *   brought to the current one by migrateNotebookDocument.
 * - `recordings[].sha256` is the hex SHA-256 of the decoded bytes; readers check it.
 *   `slot` names the slot (by `name`) the recording is bound to.
 */
export const NOTEBOOK_EXPORT_FORMAT = 'cogbook-notebook';

/** The envelope version this Cogbook writes and the newest it reads. */
export const NOTEBOOK_EXPORT_VERSION = 1;

const base64Pattern = /^[A-Za-z0-9+/]*={0,2}$/;

/** One recording embedded in an export file. */
export const exportedRecordingSchema = z.object({
  slot: z.string().min(1).max(64),
  fileName: z.string().min(1).max(255),
  format: z.enum(['fit', 'csv']),
  size: z.number().int().nonnegative(),
  sha256: z.string().regex(/^[0-9a-f]{64}$/, 'must be 64 lower-case hex digits'),
  base64: z.string().regex(base64Pattern, 'is not base64'),
});

/** The export file (version 1). `notebook` is checked separately, by its own format version. */
export const notebookExportSchema = z.object({
  format: z.literal(NOTEBOOK_EXPORT_FORMAT),
  formatVersion: z.literal(NOTEBOOK_EXPORT_VERSION),
  exportedAt: z.string(),
  source: z.object({ title: z.string().optional(), revision: z.number().int().positive().optional() }).optional(),
  notebook: z.unknown(),
  recordings: z.array(exportedRecordingSchema).max(20).optional(),
});

/** An embedded recording. */
export type ExportedRecording = z.infer<typeof exportedRecordingSchema>;

/** An export file as written. */
export interface NotebookExport {
  format: typeof NOTEBOOK_EXPORT_FORMAT;
  formatVersion: typeof NOTEBOOK_EXPORT_VERSION;
  exportedAt: string;
  source?: { title?: string; revision?: number };
  notebook: NotebookDocument;
  recordings?: ExportedRecording[];
}

/** An export file after reading: the document in the current format. */
export interface ReadNotebookExport {
  formatVersion: number;
  document: NotebookDocument;
  recordings: ExportedRecording[];
}

/**
 * Builds an export file.
 *
 * @example buildNotebookExport(doc, { exportedAt: new Date().toISOString(), source: { revision: 3 } })
 */
export function buildNotebookExport(
  document: NotebookDocument,
  options: { exportedAt: string; source?: { title?: string; revision?: number }; recordings?: ExportedRecording[] },
): NotebookExport {
  const out: NotebookExport = { format: NOTEBOOK_EXPORT_FORMAT, formatVersion: NOTEBOOK_EXPORT_VERSION, exportedAt: options.exportedAt, notebook: document };
  if (options.source) out.source = options.source;
  if (options.recordings && options.recordings.length > 0) out.recordings = options.recordings;
  return out;
}

/**
 * Reads a parsed export file: checks the envelope, refuses newer versions, brings the
 * notebook to the current format and checks that every recording names a slot of it.
 * Does not decode or hash the recordings (hosts do that with their own base64 and hash).
 *
 * @throws EngineError `import_too_new` (names both versions), `import_invalid` (names the field).
 */
export function readNotebookExport(input: unknown): ReadNotebookExport {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    throw new EngineError('import_invalid', 'the file is not a Cogbook export: it is not a JSON object');
  }
  const raw = input as Record<string, unknown>;
  if (raw['format'] !== NOTEBOOK_EXPORT_FORMAT) {
    throw new EngineError('import_invalid', `the file is not a Cogbook export: "format" should be "${NOTEBOOK_EXPORT_FORMAT}"`);
  }
  const version = raw['formatVersion'];
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    throw new EngineError('import_invalid', `"formatVersion" must be a whole number from 1, got ${JSON.stringify(version)}`);
  }
  if (version > NOTEBOOK_EXPORT_VERSION) {
    throw new EngineError(
      'import_too_new',
      `this file uses export format version ${version}, but this Cogbook reads up to version ${NOTEBOOK_EXPORT_VERSION}; open it with a newer Cogbook`,
    );
  }
  const parsed = notebookExportSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new EngineError('import_invalid', `the export file is damaged: ${issue.path.join('.') || '(file)'} ${issue.message}`);
  }
  let document: NotebookDocument;
  try {
    document = migrateNotebookDocument(parsed.data.notebook);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    const code = error instanceof EngineError && error.code === 'notebook_too_new' ? 'import_too_new' : 'import_invalid';
    throw new EngineError(code, `the notebook in the export file cannot be read: ${message}`, undefined, { cause: error });
  }
  const recordings = parsed.data.recordings ?? [];
  const slots = new Set(document.slots.map((s) => s.name));
  const seen = new Set<string>();
  for (const [i, r] of recordings.entries()) {
    if (!slots.has(r.slot)) throw new EngineError('import_invalid', `the export file is damaged: recordings.${i} is for slot "${r.slot}", which the notebook does not have`);
    if (seen.has(r.slot)) throw new EngineError('import_invalid', `the export file is damaged: two recordings for slot "${r.slot}"`);
    seen.add(r.slot);
  }
  return { formatVersion: version, document, recordings };
}
