import type { EngineErrorData } from './errors.js';
import type { CompareOptions } from './engine/compare-options.js';
import type { CompareReport } from './engine/compare-report.js';
import type { CellOutput } from './notebook/cell-output.js';
import type { NotebookDocument } from './notebook/document.js';
import type { TableSeries, TableWindow } from './notebook/table-window.js';
import type { CsvInspection } from './recording/inspect-csv.js';
import type { ImportOptions, ImportResult } from './recording/import-result.js';
import type { Recording } from './recording/recording.js';

/** Options of {@link EngineApi.runNotebook}. */
export interface EngineRunOptions {
  /** Stop a formula or chart cell after this long, ms (the runner checks; the host also enforces a hard limit). */
  cellTimeLimitMs?: number;
  /** Cells stopped in an earlier run by ending the worker (unchanged since): reported failed with this error, not computed. */
  stopped?: Record<string, EngineErrorData>;
  /** The output serials the caller holds from the last run (see notebook/output-delta.ts): those unchanged are not sent again. */
  held?: Record<string, number>;
}

/** The result of a run as it crosses the worker boundary (the cache stays in the worker). */
export interface EngineRunResult {
  /** Outputs the caller does not hold yet; with `kept`, every cell's output. */
  outputs: Record<string, CellOutput>;
  /** Cells whose output is the one the caller holds (by `held`): the caller keeps its own object. */
  kept?: string[];
  /** Serial of every fresh output of this run: what to pass as `held` next time. */
  serials?: Record<string, number>;
  /** Cell ids in run order. */
  order: string[];
  /** Cells computed in this run; the others came from the worker's cache. */
  computed: string[];
  /** Wall time of the whole run, ms. */
  durationMs: number;
}

/** An import that also binds the recording to a notebook slot inside the worker. */
export interface EngineImportOptions extends ImportOptions {
  /** Keep the recording in the worker as the input of this slot (by slot name). */
  slot?: string;
}

/**
 * What the engine web worker exposes (through comlink; every method is async across
 * the boundary). The worker keeps, between calls, the recordings bound to slots and the
 * notebook run cache, so a run after an edit recomputes only what changed.
 */
export interface EngineApi {
  /** Reads a FIT or CSV file; with `slot`, also binds the recording to that slot. Never throws. */
  importRecording(bytes: Uint8Array, fileName: string, options?: EngineImportOptions): Promise<ImportResult>;
  /** Columns, preview rows and a guessed mapping of a CSV text, for the mapping form. */
  inspectCsv(text: string, fileName?: string): Promise<CsvInspection>;
  /** Binds (or with null, clears) the recording of each named slot. */
  bindSlots(recordings: Record<string, Recording | null>): Promise<void>;
  /** Names of the slots that hold a recording in the worker. */
  boundSlots(): Promise<string[]>;
  /**
   * Runs the notebook on the bound slots, reusing the worker's cache. `onCellStart` is
   * called before each computed cell; it is a separate argument because comlink proxies
   * callbacks only at the top level of a call (wrap it with `Comlink.proxy`).
   */
  runNotebook(document: NotebookDocument, options?: EngineRunOptions, onCellStart?: (cellId: string) => void): Promise<EngineRunResult>;
  /** Rows [from, from + count) of a cell's table from the last run (undefined: no table, or not computed). */
  readCellTable(cellId: string, from: number, count: number): Promise<TableWindow | undefined>;
  /** One column of a cell's table against time, thinned to `maxPoints` for a preview chart. */
  readCellSeries(cellId: string, column: string, maxPoints: number): Promise<TableSeries | undefined>;
  /** Cells the next run would compute (changed since the last run, or reading a changed cell): show them as stale. */
  staleCells(document: NotebookDocument): Promise<string[]>;
  /** Forgets cached cell results (the next run recomputes everything). */
  clearCache(): Promise<void>;
  /** Compares devices under test with a reference (the one-shot report, outside notebooks). */
  compare(reference: Recording, tests: Recording[], options?: CompareOptions): Promise<{ ok: true; report: CompareReport } | { ok: false; error: EngineErrorData }>;
}
