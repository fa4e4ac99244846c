import * as Comlink from 'comlink';
import { readonly, shallowRef } from 'vue';
import type { EngineApi, EngineImportOptions, EngineRunResult } from '../../shared/engine-api.js';
import type { EngineErrorData } from '../../shared/errors.js';
import type { CellOutput } from '../../shared/notebook/cell-output.js';
import type { NotebookDocument } from '../../shared/notebook/document.js';
import { mergeOutputs } from '../../shared/notebook/output-delta.js';
import type { ImportResult } from '../../shared/recording/import-result.js';
import type { Recording } from '../../shared/recording/recording.js';

/** Where the engine stands: `running` a notebook, or `restarting` after a run was stopped. */
export type EnginePhase = 'idle' | 'running' | 'restarting';

/** Options of {@link createEngineClient}. */
export interface EngineClientOptions {
  /** Makes the worker; tests pass a fake. */
  createWorker?: () => Worker;
  /** A run taking longer is stopped by ending the worker, ms (default 30 s). */
  runTimeLimitMs?: number;
  /** Limit the runner itself checks inside formula and chart cells, ms (default 10 s). */
  cellTimeLimitMs?: number;
}

/** A run's outcome: the worker's result, or why it was stopped. */
export type EngineRunOutcome = ({ ok: true } & EngineRunResult) | { ok: false; error: EngineErrorData };

function createEngineWorker(): Worker {
  // The name makes the built chunk start with "engine.worker", which the server serves with its own CSP.
  return new Worker(new URL('../../workers/engine.worker.ts', import.meta.url), { type: 'module', name: 'engine' });
}

/**
 * The engine worker behind one object: imports, notebook runs with a time limit, and
 * reactive run state. A run over the limit ends the worker (the only way to stop a
 * computation in it), records which cell was running, starts a fresh worker and binds
 * the slot recordings again (the fresh worker's cache is empty).
 */
export function createEngineClient(options: EngineClientOptions = {}) {
  const makeWorker = options.createWorker ?? createEngineWorker;
  const runTimeLimitMs = options.runTimeLimitMs ?? 30_000;
  const cellTimeLimitMs = options.cellTimeLimitMs ?? 10_000;
  let worker = makeWorker();
  let api = Comlink.wrap<EngineApi>(worker);
  // The recordings bound to slots, kept here too so a restarted worker can get them back.
  const bound = new Map<string, Recording>();
  // Cells that ran out of time and ended the worker, with the cell as it was then: until it
  // changes, later runs skip it (reported failed) so the other cells still compute.
  const stopped = new Map<string, { fingerprint: string; error: EngineErrorData }>();
  const fingerprint = (cell: NotebookDocument['cells'][number]): string => JSON.stringify([cell.name, cell.kind, cell.config]);

  const phase = shallowRef<EnginePhase>('idle');
  const runningCellId = shallowRef<string | null>(null);
  const outputs = shallowRef<Record<string, CellOutput>>({});
  const lastRun = shallowRef<{ durationMs: number; computed: string[] } | null>(null);
  const lastError = shallowRef<EngineErrorData | null>(null);
  // Serials of the outputs held in `outputs` (the worker then sends only what changed).
  let held: Record<string, number> = {};

  async function restart(): Promise<void> {
    phase.value = 'restarting';
    api[Comlink.releaseProxy]();
    worker.terminate();
    worker = makeWorker();
    api = Comlink.wrap<EngineApi>(worker);
    held = {};
    if (bound.size > 0) await api.bindSlots(Object.fromEntries(bound));
  }

  async function importRecording(bytes: Uint8Array, fileName: string, importOptions: EngineImportOptions = {}): Promise<ImportResult> {
    const result = await api.importRecording(bytes, fileName, importOptions);
    if (result.ok && importOptions.slot !== undefined) bound.set(importOptions.slot, result.recording);
    return result;
  }

  async function bindSlots(recordings: Record<string, Recording | null>): Promise<void> {
    for (const [name, r] of Object.entries(recordings)) r === null ? bound.delete(name) : bound.set(name, r);
    await api.bindSlots(recordings);
  }

  async function run(document: NotebookDocument): Promise<EngineRunOutcome> {
    phase.value = 'running';
    runningCellId.value = null;
    lastError.value = null;
    const skip: Record<string, EngineErrorData> = {};
    for (const [id, entry] of stopped) {
      const cell = document.cells.find((c) => c.id === id);
      if (cell && fingerprint(cell) === entry.fingerprint) skip[id] = entry.error;
      else stopped.delete(id);
    }
    const onCellStart = Comlink.proxy((id: string) => {
      runningCellId.value = id;
    });
    let timer: ReturnType<typeof setTimeout> | undefined;
    const timedOut = new Promise<'timeout'>((resolve) => {
      timer = setTimeout(() => resolve('timeout'), runTimeLimitMs);
    });
    try {
      const options = { cellTimeLimitMs, held, ...(stopped.size > 0 ? { stopped: skip } : {}) };
      const result = await Promise.race([api.runNotebook(document, options, onCellStart), timedOut]);
      if (result !== 'timeout') {
        // Unchanged outputs keep their objects, so their charts and tables are not drawn again.
        const merged = result.kept ? mergeOutputs(outputs.value, { outputs: result.outputs, kept: result.kept }, result.order) : result.outputs;
        outputs.value = merged;
        held = result.serials ?? {};
        lastRun.value = { durationMs: result.durationMs, computed: result.computed };
        return { ok: true, ...result, outputs: merged };
      }
      const cellId = runningCellId.value;
      const cell = document.cells.find((c) => c.id === cellId);
      const error: EngineErrorData = {
        code: 'run_timeout',
        message: `the run was stopped after ${Math.round(runTimeLimitMs / 1000)} s${cell ? ` while computing cell "${cell.name}"` : ''}`,
        ...(cellId ? { where: { cell: cellId } } : {}),
      };
      if (cell) {
        const onCell: EngineErrorData = { ...error, message: `${error.message}; the engine was restarted, and this cell waits until you change it` };
        stopped.set(cell.id, { fingerprint: fingerprint(cell), error: onCell });
        const base = { cellId: cell.id, name: cell.name, kind: cell.kind, durationMs: runTimeLimitMs, cached: false, warnings: [] };
        outputs.value = { ...outputs.value, [cell.id]: { ...base, state: 'failed', error: onCell } };
        delete held[cell.id];
      }
      lastError.value = error;
      await restart();
      return { ok: false, error };
    } finally {
      clearTimeout(timer);
      phase.value = 'idle';
      runningCellId.value = null;
    }
  }

  return {
    phase: readonly(phase),
    runningCellId: readonly(runningCellId),
    outputs: readonly(outputs),
    lastRun: readonly(lastRun),
    lastError: readonly(lastError),
    importRecording,
    bindSlots,
    run,
    inspectCsv: (text: string, fileName?: string) => api.inspectCsv(text, fileName),
    compare: (...args: Parameters<EngineApi['compare']>) => api.compare(...args),
    readCellTable: (cellId: string, from: number, count: number) => api.readCellTable(cellId, from, count),
    readCellSeries: (cellId: string, column: string, maxPoints: number) => api.readCellSeries(cellId, column, maxPoints),
    staleCells: (document: NotebookDocument) => api.staleCells(document),
    clearCache: () => api.clearCache(),
    /** Ends the worker for good (page teardown, tests). */
    dispose: () => worker.terminate(),
  };
}

/** The engine client type. */
export type EngineClient = ReturnType<typeof createEngineClient>;

let shared: EngineClient | undefined;

/** The app's one engine worker, created on first use. */
export function useEngine(): EngineClient {
  shared ??= createEngineClient();
  return shared;
}
