import { EngineError, isEngineError, type EngineErrorData, type EngineWarning } from '../errors.js';
import { createFormulaEngine, type FormulaEngine } from '../formula/create-formula-engine.js';
import { evaluateFormula } from '../formula/evaluate-formula.js';
import type { FormulaValue } from '../formula/formula-value.js';
import type { Recording } from '../recording/recording.js';
import { buildGraph, type GraphCell, type NotebookGraph } from './build-graph.js';
import { resultOf, type CellOutput } from './cell-output.js';
import { formulaView, type CellValue } from './cell-value.js';
import type { NotebookDocument } from './document.js';
import { cellKeys } from './cell-keys.js';
import { buildChart } from './run-chart.js';
import { runTransform } from './transforms/run-transform.js';

/** What a run keeps for the next one: each cell's key and full value. Lives in the host (worker). */
export interface RunCache {
  entries: Record<string, { key: string; value: CellValue; output: CellOutput }>;
}

/** Options of {@link runNotebook}. */
export interface RunNotebookOptions {
  /** A formula engine to reuse (creating one takes tens of ms). */
  engine?: FormulaEngine;
  /** Stop a formula or chart cell after this long, ms (checked between statements and inside its functions). */
  cellTimeLimitMs?: number;
  /** Called before a cell is computed (not for cached ones): hosts report progress and which cell ran out of time. */
  onCellStart?: (cellId: string) => void;
  /** Clock in ms; default Date.now. */
  now?: () => number;
  /**
   * Cells the host had to stop in an earlier run (it ended the worker), by cell id, with the
   * error to show: they are not computed again, so one runaway cell cannot stop every later run.
   */
  stopped?: Record<string, EngineErrorData>;
}

/** The outcome of a run. */
export interface RunNotebookResult {
  /** Every cell's output, by cell id. */
  outputs: Record<string, CellOutput>;
  /** Cell ids in the order they ran. */
  order: string[];
  /** Pass to the next run to reuse unchanged cells. */
  cache: RunCache;
  /** Cells computed (not reused) in this run. */
  computed: string[];
}

function errorData(e: unknown, cell: string): EngineErrorData {
  if (isEngineError(e)) {
    const d = e.toData();
    return d.where?.cell ? d : { ...d, where: { ...d.where, cell } };
  }
  return { code: 'cell_failed', message: e instanceof Error ? e.message : String(e), where: { cell } };
}

/**
 * Runs a notebook: every cell after the cells it reads, each cell's result reused from
 * `previous` when its key (a hash of its config, the parameters it reads and the keys
 * of its inputs) is unchanged, so editing one cell recomputes it and only what depends
 * on it. Pure: the same document, inputs and cache give the same outputs; nothing is
 * thrown for a cell's failure, it is reported on the cell and its dependents are
 * `blocked` with the name of the failed cell.
 *
 * @param inputs the recording bound to each slot, by slot name
 * @example
 * const first = runNotebook(doc, { reference, dut });
 * const again = runNotebook(editedDoc, { reference, dut }, first.cache); // recomputes only what changed
 */
export function runNotebook(
  document: NotebookDocument,
  inputs: Record<string, Recording>,
  previous?: RunCache,
  options: RunNotebookOptions = {},
): RunNotebookResult {
  const engine = options.engine ?? createFormulaEngine();
  const now = options.now ?? Date.now;
  const graph = buildGraph(document, engine);
  const params = new Map(document.parameters.map((p) => [p.name, p.value]));
  const keys = cellKeys(graph, document, inputs);
  const outputs: Record<string, CellOutput> = {};
  const values = new Map<string, CellValue>();
  const cache: RunCache = { entries: {} };
  const computed: string[] = [];

  for (const id of graph.order) {
    const g = graph.cells[id]!;
    const { cell } = g;
    const base = { cellId: id, name: cell.name, kind: cell.kind, durationMs: 0, cached: false, warnings: [] as EngineWarning[] };
    if (g.error) {
      outputs[id] = { ...base, state: 'failed', error: g.error };
      continue;
    }
    const stoppedError = options.stopped?.[id];
    if (stoppedError) {
      outputs[id] = { ...base, state: 'failed', error: stoppedError };
      continue;
    }
    const upstream = g.dependsOn.find((d) => outputs[d]!.state !== 'fresh');
    if (upstream !== undefined) {
      const up = outputs[upstream]!;
      const root = up.state === 'blocked' && up.blockedBy ? up.blockedBy : { cellId: upstream, name: up.name, reason: 'failed' as const };
      outputs[id] = { ...base, state: 'blocked', blockedBy: root };
      continue;
    }
    let recording: Recording | undefined;
    if (cell.kind === 'import') {
      recording = inputs[cell.config.slot];
      if (recording === undefined) {
        outputs[id] = { ...base, state: 'blocked', blockedBy: { name: cell.config.slot, reason: 'empty_slot' } };
        continue;
      }
    }
    const key = keys.get(id)!;
    const hit = previous?.entries[id];
    if (hit !== undefined && hit.key === key) {
      values.set(id, hit.value);
      outputs[id] = { ...hit.output, durationMs: 0, cached: true };
      cache.entries[id] = hit;
      continue;
    }
    options.onCellStart?.(id);
    computed.push(id);
    const started = now();
    try {
      const { value, warnings } = computeCell(g, graph, values, params, engine, document, recording, {
        deadlineMs: options.cellTimeLimitMs === undefined ? Infinity : started + options.cellTimeLimitMs,
        now,
      });
      values.set(id, value);
      const output: CellOutput = { ...base, state: 'fresh', durationMs: now() - started, result: resultOf(value), warnings };
      outputs[id] = output;
      cache.entries[id] = { key, value, output };
    } catch (e) {
      outputs[id] = { ...base, state: 'failed', durationMs: now() - started, error: errorData(e, id) };
    }
  }
  return { outputs, order: graph.order, cache, computed };
}

/**
 * The cells a run would compute rather than reuse from `previous`: the ones to show as
 * `stale` after an edit, before the run. Parses formulas but computes nothing.
 *
 * @example staleCells(editedDoc, inputs, lastRun.cache, { engine }) // ['b', 'c']
 */
export function staleCells(
  document: NotebookDocument,
  inputs: Record<string, Recording>,
  previous: RunCache | undefined,
  options: Pick<RunNotebookOptions, 'engine'> = {},
): string[] {
  const graph = buildGraph(document, options.engine ?? createFormulaEngine());
  const keys = cellKeys(graph, document, inputs);
  return graph.order.filter((id) => previous?.entries[id]?.key !== keys.get(id));
}

/** What a formula or chart binding sees: the names it reads, resolved to values. */
function scopeFor(g: GraphCell, graph: NotebookGraph, values: Map<string, CellValue>, params: Map<string, number>): Record<string, FormulaValue> {
  const scope: Record<string, FormulaValue> = {};
  for (const name of g.reads) {
    const producer = graph.producers[name];
    if (producer !== undefined && producer !== g.cell.id) {
      const value = values.get(producer)!;
      const view = value.kind === 'values' && graph.cells[producer]!.cell.name !== name ? value.values[name] : formulaView(value);
      if (view !== undefined) scope[name] = view;
    } else if (params.has(name)) scope[name] = params.get(name)!;
  }
  return scope;
}

function computeCell(
  g: GraphCell,
  graph: NotebookGraph,
  values: Map<string, CellValue>,
  params: Map<string, number>,
  engine: FormulaEngine,
  document: NotebookDocument,
  recording: Recording | undefined,
  limits: { deadlineMs: number; now: () => number },
): { value: CellValue; warnings: EngineWarning[] } {
  const { cell } = g;
  const read = (name: string): CellValue => values.get(graph.producers[name]!)!;
  switch (cell.kind) {
    case 'import':
      return { value: { kind: 'recording', recording: recording! }, warnings: [] };
    case 'transform':
      return { value: { kind: 'table', ...runTransform(cell.config, read) }, warnings: [] };
    case 'formula': {
      const r = evaluateFormula(engine, g.formula!, scopeFor(g, graph, values, params), cell.config.source, cell.id, limits);
      const value: CellValue = r.last === undefined ? { kind: 'values', values: r.values } : { kind: 'values', values: r.values, last: r.last };
      return { value, warnings: r.warnings };
    }
    case 'chart': {
      const scope = scopeFor(g, graph, values, params);
      const bound: Record<string, FormulaValue | undefined> = {};
      const warnings: EngineWarning[] = [];
      for (const [binding, analysis] of Object.entries(g.bindings!)) {
        try {
          const r = evaluateFormula(engine, analysis, scope, cell.config.bindings[binding]!, cell.id, limits);
          bound[binding] = r.last ?? Object.values(r.values).at(-1);
        } catch (e) {
          const d = errorData(e, cell.id);
          throw new EngineError(d.code, `chart binding "${binding}": ${d.message}`, { cell: cell.id, field: binding });
        }
      }
      return { value: { kind: 'chart', spec: buildChart(cell.config, bound, document.slots, cell.id) }, warnings };
    }
    case 'note':
      return { value: { kind: 'note', markdown: cell.config.markdown }, warnings: [] };
  }
}
