import type { Snapshot, SnapshotInput } from '../../shared/api/snapshots.js';
import type { NotebookDocument } from '../../shared/notebook/document.js';
import { runNotebook } from '../../shared/notebook/run-notebook.js';
import { csvMappingSchema } from '../../shared/recording/csv-mapping.js';
import { importRecording } from '../../shared/recording/import-recording.js';
import type { Recording } from '../../shared/recording/recording.js';
import { buildSnapshot } from './build-snapshot.js';
import { drawSnapshotCharts } from './chart-svg.js';
import { tableCsv } from './table-csv.js';

/** One recording handed to a computation, bound to a slot by name. */
export interface ComputeInput extends SnapshotInput {
  bytes: Uint8Array;
}

/** What the server (or the recipe command) asks the engine to compute. Plain data: it crosses a worker boundary. */
export interface ComputeJob {
  document: NotebookDocument;
  revision: number;
  inputs: ComputeInput[];
  /** Also return this cell's whole table as CSV. */
  csvCellId?: string;
  /** Stop one formula or chart cell after this long, ms. */
  cellTimeLimitMs?: number;
  /** Also draw every chart as SVG into the snapshot (published pages show those). */
  drawCharts?: boolean;
}

/** The outcome: a snapshot, or the first input that could not be read. */
export type ComputeOutcome =
  | { ok: true; snapshot: Snapshot; csv?: string | null }
  | { ok: false; error: { code: string; message: string; file?: string; slot?: string } };

/** Default per-cell time limit for headless runs. */
export const HEADLESS_CELL_LIMIT_MS = 60_000;

/**
 * Reads every input with the shared importer (each slot's remembered CSV mapping, or
 * the import cell's), runs the notebook with the shared runner and builds the
 * snapshot. The same function runs inside the worker thread and in the recipe command.
 */
export async function computeNotebook(job: ComputeJob): Promise<ComputeOutcome> {
  const started = performance.now();
  const recordings: Record<string, Recording> = {};
  for (const input of job.inputs) {
    const slot = job.document.slots.find((s) => s.name === input.slot);
    const importCell = job.document.cells.find((c) => c.kind === 'import' && c.config.slot === input.slot);
    const mapping = csvMappingSchema.safeParse(slot?.csvMapping ?? (importCell?.kind === 'import' ? importCell.config.csvMapping : undefined));
    const result = await importRecording(input.bytes, input.fileName, {
      ...(mapping.success ? { csvMapping: mapping.data } : {}),
      ...(slot?.label ? { label: slot.label } : {}),
      ...(slot?.readDamaged ? { readDamaged: true } : {}),
    });
    if (!result.ok) {
      const message = result.error.message.includes(input.fileName) ? result.error.message : `${input.fileName}: ${result.error.message}`;
      return { ok: false, error: { code: result.error.code, message, file: input.fileName, slot: input.slot } };
    }
    recordings[input.slot] = result.recording;
  }
  const run = runNotebook(job.document, recordings, undefined, { cellTimeLimitMs: job.cellTimeLimitMs ?? HEADLESS_CELL_LIMIT_MS });
  const snapshot = buildSnapshot(job.document, run, {
    revision: job.revision,
    computedAt: new Date().toISOString(),
    durationMs: performance.now() - started,
    inputs: job.inputs.map(({ bytes: _bytes, ...meta }) => meta),
  });
  if (job.drawCharts) await drawSnapshotCharts(snapshot);
  if (job.csvCellId === undefined) return { ok: true, snapshot };
  const value = run.cache.entries[job.csvCellId]?.value;
  return { ok: true, snapshot, csv: value?.kind === 'table' ? tableCsv(value.table) : null };
}
