// The engine behind comlink. It only adapts: state kept here is the slot recordings and
// the run cache, so interactive runs are incremental. No arquero is used in this worker.
import * as Comlink from 'comlink';
import type { EngineApi } from '../shared/engine-api.js';
import { isEngineError } from '../shared/errors.js';
import { compareRecordings } from '../shared/engine/compare.js';
import { createFormulaEngine } from '../shared/formula/create-formula-engine.js';
import { createOutputLedger } from '../shared/notebook/output-delta.js';
import { runNotebook, staleCells, type RunCache } from '../shared/notebook/run-notebook.js';
import { tableSeries, tableWindow } from '../shared/notebook/table-window.js';
import { importRecording } from '../shared/recording/import-recording.js';
import { inspectCsv } from '../shared/recording/inspect-csv.js';
import type { Recording } from '../shared/recording/recording.js';

const formulaEngine = createFormulaEngine();
const slots = new Map<string, Recording>();
let cache: RunCache | undefined;
const ledger = createOutputLedger();

const api: EngineApi = {
  async importRecording(bytes, fileName, options = {}) {
    const { slot, ...importOptions } = options;
    const result = await importRecording(bytes, fileName, importOptions);
    if (!result.ok) return result;
    if (slot !== undefined) {
      slots.set(slot, result.recording);
      return result; // kept here too, so copied rather than transferred
    }
    const columns = Object.values(result.recording.columns).map((c) => c.buffer as ArrayBuffer);
    return Comlink.transfer(result, [result.recording.time.buffer as ArrayBuffer, ...columns]);
  },
  async inspectCsv(text, fileName) {
    return inspectCsv(text, fileName);
  },
  async bindSlots(recordings) {
    for (const [name, r] of Object.entries(recordings)) r === null ? slots.delete(name) : slots.set(name, r);
  },
  async boundSlots() {
    return [...slots.keys()];
  },
  async runNotebook(document, options = {}, onCellStart) {
    const started = performance.now();
    const { cellTimeLimitMs, stopped, held } = options;
    const result = runNotebook(document, Object.fromEntries(slots), cache, {
      engine: formulaEngine,
      ...(cellTimeLimitMs !== undefined ? { cellTimeLimitMs } : {}),
      ...(stopped ? { stopped } : {}),
      // A progress report that cannot be delivered must not fail the run.
      ...(onCellStart ? { onCellStart: (id: string) => void Promise.resolve(onCellStart(id)).catch(() => undefined) } : {}),
    });
    cache = result.cache;
    const delta = ledger.delta(result.outputs, result.cache, held);
    return { ...delta, order: result.order, computed: result.computed, durationMs: performance.now() - started };
  },
  async readCellTable(cellId, from, count) {
    const entry = cache?.entries[cellId];
    return entry ? tableWindow(entry.value, from, count) : undefined;
  },
  async readCellSeries(cellId, column, maxPoints) {
    const entry = cache?.entries[cellId];
    return entry ? tableSeries(entry.value, column, maxPoints) : undefined;
  },
  async staleCells(document) {
    return staleCells(document, Object.fromEntries(slots), cache, { engine: formulaEngine });
  },
  async clearCache() {
    cache = undefined;
  },
  async compare(reference, tests, options) {
    try {
      return { ok: true, report: compareRecordings(reference, tests, options) };
    } catch (e) {
      if (isEngineError(e)) return { ok: false, error: e.toData() };
      throw e;
    }
  },
};

Comlink.expose(api);
