import { type EngineErrorData } from '../errors.js';
import { isEngineError } from '../errors.js';
import { analyseFormula, type FormulaAnalysis } from '../formula/analyse-formula.js';
import type { FormulaEngine } from '../formula/create-formula-engine.js';
import { findName } from '../formula/source-position.js';
import { CHART_BINDINGS } from './cell-config.js';
import type { NotebookCell, NotebookDocument } from './document.js';

/** What the graph knows about one cell. */
export interface GraphCell {
  cell: NotebookCell;
  /** Position in the document (0-based). */
  index: number;
  /** Names of cells and parameters it reads. */
  reads: string[];
  /** Names it gives to later cells: its own name, plus each assignment of a formula. */
  writes: string[];
  /** Ids of the cells it reads from. */
  dependsOn: string[];
  /** Parameters it reads. */
  parameters: string[];
  /** Parsed formula (formula cells) or parsed bindings (chart cells, by binding name). */
  formula?: FormulaAnalysis;
  bindings?: Record<string, FormulaAnalysis>;
  /** Set when the cell cannot run whatever its inputs are (syntax, unknown name, cycle). */
  error?: EngineErrorData;
}

/** The dependency graph of a notebook. */
export interface NotebookGraph {
  cells: Record<string, GraphCell>;
  /** Cell ids, each after every cell it reads (document order where free). Cells in a cycle are last. */
  order: string[];
  /** Which cell gives each name. */
  producers: Record<string, string>;
  /** Each cycle found, as cell ids in reading order (first repeated at the end for messages). */
  cycles: string[][];
}

/** Names a cell reads, from its config (formulas and chart bindings are parsed). */
function readsOf(engine: FormulaEngine, cell: NotebookCell, g: GraphCell): string[] {
  switch (cell.kind) {
    case 'import':
    case 'note':
      return [];
    case 'transform': {
      const c = cell.config;
      if (c.op === 'align') return [c.reference, c.test];
      if (c.op === 'combine') return [...c.sources];
      return [c.source];
    }
    case 'formula':
      g.formula = analyseFormula(engine, cell.config.source, cell.id);
      return [...g.formula.reads, ...g.formula.unitNames];
    case 'chart': {
      g.bindings = {};
      const names: string[] = [];
      for (const [key, source] of Object.entries(cell.config.bindings)) {
        if (source.trim() === '') continue;
        const a = analyseFormula(engine, source, cell.id);
        g.bindings[key] = a;
        names.push(...a.reads, ...a.unitNames);
      }
      const missing = CHART_BINDINGS[cell.config.preset].filter((b) => !b.endsWith('?') && !(cell.config.bindings[b] ?? '').trim());
      if (missing.length > 0 && cell.config.spec === undefined) {
        g.error = { code: 'chart_binding_missing', message: `chart needs ${missing.join(', ')}`, where: { cell: cell.id, field: missing[0]! } };
      }
      return names;
    }
  }
}

function toData(e: unknown, cell: string): EngineErrorData {
  if (isEngineError(e)) return e.toData();
  return { code: 'cell_invalid', message: e instanceof Error ? e.message : String(e), where: { cell } };
}

/** Depth-first search for the cycles among `ids`, each reported once. */
function findCycles(ids: string[], cells: Record<string, GraphCell>): string[][] {
  const cycles: string[][] = [];
  const state = new Map<string, 'open' | 'done'>();
  const stack: string[] = [];
  const visit = (id: string): void => {
    state.set(id, 'open');
    stack.push(id);
    for (const dep of cells[id]!.dependsOn) {
      if (!ids.includes(dep)) continue;
      if (state.get(dep) === 'open') cycles.push([...stack.slice(stack.indexOf(dep)), dep]);
      else if (!state.has(dep)) visit(dep);
    }
    stack.pop();
    state.set(id, 'done');
  };
  for (const id of ids) if (!state.has(id)) visit(id);
  return cycles;
}

/**
 * Builds the dependency graph: what each cell reads and writes, which cell gives each
 * name, an order that runs every cell after its inputs, and any cycles. Problems that
 * stop a cell whatever its inputs (a formula that does not parse, an unknown name, a name
 * given twice, a cycle) are recorded on the cell, not thrown.
 *
 * @example buildGraph(doc, engine).order // ['ref', 'dut', 'aligned', 'stats', 'chart1']
 */
export function buildGraph(document: NotebookDocument, engine: FormulaEngine): NotebookGraph {
  const cells: Record<string, GraphCell> = {};
  const producers: Record<string, string> = {};
  const parameters = new Set(document.parameters.map((p) => p.name));
  const slots = new Set(document.slots.map((s) => s.name));
  const nameOf = (id: string) => cells[id]!.cell.name;

  document.cells.forEach((cell, index) => {
    const g: GraphCell = { cell, index, reads: [], writes: [cell.name], dependsOn: [], parameters: [] };
    cells[cell.id] = g;
    try {
      g.reads = [...new Set(readsOf(engine, cell, g))];
    } catch (e) {
      g.error = toData(e, cell.id);
    }
    if (cell.kind === 'import' && !slots.has(cell.config.slot)) {
      g.error = { code: 'slot_unknown', message: `no input slot named "${cell.config.slot}"`, where: { cell: cell.id, field: 'slot' } };
    }
    if (g.formula) g.writes.push(...g.formula.writes);
    for (const name of g.writes) {
      const other = producers[name];
      if (parameters.has(name) || (other !== undefined && other !== cell.id)) {
        const owner = parameters.has(name) ? `parameter ${name}` : `cell "${nameOf(other!)}"`;
        g.error ??= { code: 'name_taken', message: `"${name}" is already given by ${owner}; choose another name`, where: { cell: cell.id, ...(cell.kind === 'formula' ? findName(cell.config.source, name) : { field: 'name' }) } };
      } else producers[name] = cell.id;
    }
  });

  for (const g of Object.values(cells)) {
    for (const name of g.reads) {
      const producer = producers[name];
      if (producer !== undefined && producer !== g.cell.id) g.dependsOn.push(producer);
      else if (parameters.has(name)) g.parameters.push(name);
      else if (g.cell.kind === 'formula' && g.formula!.unitNames.includes(name)) continue;
      else if (g.cell.kind === 'chart' && Object.values(g.bindings!).some((b) => b.unitNames.includes(name))) continue;
      else if (producer === undefined) {
        const pos = g.cell.kind === 'formula' ? findName(g.cell.config.source, name) : undefined;
        g.error ??= { code: 'formula_unknown_name', message: `unknown name "${name}"${pos ? ` at line ${pos.line}, column ${pos.column}` : ''}: no cell or parameter has that name`, where: { cell: g.cell.id, ...pos } };
      }
    }
    g.dependsOn = [...new Set(g.dependsOn)];
  }

  // Kahn's algorithm, always taking the earliest ready cell so the order follows the document.
  const remaining = new Map(Object.values(cells).map((g) => [g.cell.id, g.dependsOn.length]));
  const order: string[] = [];
  const ready = document.cells.filter((c) => remaining.get(c.id) === 0).map((c) => c.id);
  while (ready.length > 0) {
    ready.sort((a, b) => cells[a]!.index - cells[b]!.index);
    const id = ready.shift()!;
    order.push(id);
    remaining.delete(id);
    for (const g of Object.values(cells)) {
      if (!g.dependsOn.includes(id) || !remaining.has(g.cell.id)) continue;
      const left = remaining.get(g.cell.id)! - 1;
      remaining.set(g.cell.id, left);
      if (left === 0) ready.push(g.cell.id);
    }
  }
  const stuck = document.cells.map((c) => c.id).filter((id) => remaining.has(id));
  const cycles = findCycles(stuck, cells);
  for (const cycle of cycles) {
    const path = cycle.map(nameOf).join(' -> ');
    for (const id of cycle.slice(0, -1)) {
      cells[id]!.error ??= { code: 'notebook_cycle', message: `cells read each other in a circle: ${path}; break it by removing one of these reads`, where: { cell: id } };
    }
  }
  order.push(...stuck);
  return { cells, order, producers, cycles };
}

/**
 * Ids of the cells that read `cellId`, directly or through others, in run order: what
 * must recompute when it changes.
 */
export function dependentsOf(graph: NotebookGraph, cellId: string): string[] {
  const hit = new Set([cellId]);
  for (const id of graph.order) {
    if (graph.cells[id]!.dependsOn.some((d) => hit.has(d))) hit.add(id);
  }
  hit.delete(cellId);
  return graph.order.filter((id) => hit.has(id));
}
