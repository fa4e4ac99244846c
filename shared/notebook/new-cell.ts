import { chartConfigSchema, transformConfigSchema, type ChartPreset, type TransformOp } from './cell-config.js';
import type { CellKind, NotebookCell, NotebookDocument, NotebookSlot } from './document.js';

/** A name not yet given by a cell or parameter of `document`: `base`, else `base_2`, `base_3`, ... */
export function freeName(document: NotebookDocument, base: string): string {
  const taken = new Set([...document.cells.map((c) => c.name), ...document.parameters.map((p) => p.name)]);
  if (!taken.has(base)) return base;
  for (let i = 2; ; i++) if (!taken.has(`${base}_${i}`)) return `${base}_${i}`;
}

/** An id not used by any cell (ids never change, names may). */
export function freeCellId(document: NotebookDocument, kind: CellKind): string {
  const ids = new Set(document.cells.map((c) => c.id));
  for (let i = document.cells.length + 1; ; i++) if (!ids.has(`${kind}-${i}`)) return `${kind}-${i}`;
}

/** A slot name not yet used: `reference` first, then `test`, then `test_2`, ... */
export function freeSlot(document: NotebookDocument): NotebookSlot {
  const used = new Set(document.slots.map((s) => s.name));
  const name = !used.has('reference') ? 'reference' : !used.has('test') ? 'test' : [...Array(40).keys()].map((i) => `test_${i + 2}`).find((n) => !used.has(n))!;
  const label = name === 'reference' ? 'Reference' : name === 'test' ? 'Device under test' : `Device under test ${name.slice(5)}`;
  return { id: name, name, label, uploadId: null };
}

/** Where a new cell reads from by default: the names of cells before `index` of the given kinds. */
function earlier(document: NotebookDocument, index: number, kinds: CellKind[]): string[] {
  return document.cells.slice(0, index).filter((c) => kinds.includes(c.kind)).map((c) => c.name);
}

/** Options of {@link newCell}. */
export interface NewCellOptions {
  /** Where the cell will be inserted (default: at the end); its defaults read the cells above. */
  index?: number;
  /** The op of a new transform cell (default `align` when two imports exist, else `resample`). */
  op?: TransformOp;
  preset?: ChartPreset;
  /** The slot a new import cell reads (default: the first slot no import cell reads). */
  slot?: string;
}

/**
 * A new cell of `kind` with a unique id and name and a config that already points at the
 * cells above it (an align reads the last two imports, a transform the last table), so a
 * fresh cell usually runs as soon as it is added.
 *
 * @example newCell(doc, 'transform', { op: 'segment' }) // reads the latest transform output
 */
export function newCell(document: NotebookDocument, kind: CellKind, options: NewCellOptions = {}): NotebookCell {
  const index = options.index ?? document.cells.length;
  const id = freeCellId(document, kind);
  const imports = earlier(document, index, ['import']);
  const tables = earlier(document, index, ['import', 'transform']);
  const lastTable = tables.at(-1) ?? 'aligned';
  switch (kind) {
    case 'import': {
      const readSlots = new Set(document.cells.flatMap((c) => (c.kind === 'import' ? [c.config.slot] : [])));
      const slot = options.slot ?? document.slots.find((s) => !readSlots.has(s.name))?.name ?? freeSlot(document).name;
      const base = slot === 'reference' ? 'ref' : slot === 'test' ? 'dut' : slot;
      return { id, kind, name: freeName(document, base), config: { slot } };
    }
    case 'transform': {
      const op = options.op ?? (imports.length >= 2 ? 'align' : 'resample');
      const raw: Record<string, unknown> =
        op === 'align'
          ? { op, reference: imports.at(-2) ?? 'ref', test: imports.at(-1) ?? 'dut' }
          : op === 'combine'
            ? { op, sources: imports.length >= 2 ? imports : ['ref', 'dut'] }
            : op === 'resample'
              ? { op, source: imports.at(-1) ?? lastTable }
              : { op, source: lastTable };
      const names: Record<TransformOp, string> = { align: 'aligned', resample: 'resampled', smooth: 'smoothed', trim: 'trimmed', segment: 'blocks', gears: 'geared', combine: 'combined' };
      return { id, kind, name: freeName(document, names[op]), config: transformConfigSchema.parse(raw) };
    }
    case 'formula':
      return { id, kind, name: freeName(document, 'stats'), config: { source: '' } };
    case 'chart': {
      const preset = options.preset ?? 'traces';
      return { id, kind, name: freeName(document, 'chart'), config: chartConfigSchema.parse({ preset, bindings: {} }) };
    }
    case 'note':
      return { id, kind, name: freeName(document, 'note'), config: { markdown: '' } };
  }
}

/**
 * A copy of `cell` with a new id and name, for duplicating. A formula's own assignments
 * would clash with the original's, so the copy's source is kept but the caller should
 * expect the runner to report the clash until one of them is edited.
 */
export function copyCell(document: NotebookDocument, cell: NotebookCell): NotebookCell {
  const copy = JSON.parse(JSON.stringify(cell)) as NotebookCell;
  copy.id = freeCellId(document, cell.kind);
  copy.name = freeName(document, `${cell.name}_copy`);
  return copy;
}
