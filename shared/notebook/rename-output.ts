import { identifierSchema } from './cell-config.js';
import type { NotebookCell, NotebookDocument } from './document.js';

/** The outcome of {@link renameOutput}: the new document, or why the name cannot be used. */
export type RenameOutputResult = { ok: true; document: NotebookDocument; changedCells: string[] } | { ok: false; message: string };

/**
 * Replaces every use of the name `from` in a formula source by `to`: whole words only,
 * not inside strings or comments, not after a dot (`x.aligned` is a field, not the cell)
 * and not a function call (`aligned(` would be a function of that name).
 *
 * @example renameInFormula('p = ratio(aligned.test_power, aligned.ref_power)', 'aligned', 'paired')
 * // 'p = ratio(paired.test_power, paired.ref_power)'
 */
export function renameInFormula(source: string, from: string, to: string): string {
  const token = /"(?:[^"\\]|\\.)*"|'(?:[^'\\]|\\.)*'|#[^\n]*|[A-Za-z_][A-Za-z0-9_]*/g;
  let out = '';
  let last = 0;
  for (let m = token.exec(source); m !== null; m = token.exec(source)) {
    if (m[0] !== from) continue;
    const afterDot = source.slice(0, m.index).trimEnd().endsWith('.');
    const call = /^\s*\(/.test(source.slice(m.index + m[0].length));
    if (afterDot || call) continue;
    out += source.slice(last, m.index) + to;
    last = m.index + m[0].length;
  }
  return out + source.slice(last);
}

/** The cell with its references to `from` pointed at `to`; the same object when nothing changed. */
function renameReferences(cell: NotebookCell, from: string, to: string): NotebookCell {
  const swap = (name: string) => (name === from ? to : name);
  switch (cell.kind) {
    case 'transform': {
      const c = cell.config;
      let config = c;
      if (c.op === 'align') config = { ...c, reference: swap(c.reference), test: swap(c.test) };
      else if (c.op === 'combine') config = { ...c, sources: c.sources.map(swap) };
      else config = { ...c, source: swap(c.source) };
      return JSON.stringify(config) === JSON.stringify(c) ? cell : { ...cell, config };
    }
    case 'formula': {
      const source = renameInFormula(cell.config.source, from, to);
      return source === cell.config.source ? cell : { ...cell, config: { ...cell.config, source } };
    }
    case 'chart': {
      const bindings: Record<string, string> = {};
      let changed = false;
      for (const [k, v] of Object.entries(cell.config.bindings)) {
        bindings[k] = renameInFormula(v, from, to);
        changed ||= bindings[k] !== v;
      }
      return changed ? { ...cell, config: { ...cell.config, bindings } } : cell;
    }
    default:
      return cell;
  }
}

/**
 * Renames the output of one cell and makes every other cell that read the old name read
 * the new one (transform sources, formula sources, chart bindings), so a rename never
 * breaks the notebook. Refuses names that are not identifiers or that a parameter or
 * another cell already gives. Pure: the input document is not changed.
 *
 * @example renameOutput(doc, 'align', 'paired') // { ok: true, document, changedCells: ['stats', 'chart1'] }
 */
export function renameOutput(document: NotebookDocument, cellId: string, to: string): RenameOutputResult {
  const target = document.cells.find((c) => c.id === cellId);
  if (target === undefined) return { ok: false, message: `no cell with id "${cellId}"` };
  const from = target.name;
  if (to === from) return { ok: true, document, changedCells: [] };
  const checked = identifierSchema.safeParse(to);
  if (!checked.success) return { ok: false, message: `"${to}" cannot be a name: ${checked.error.issues[0]?.message ?? 'not an identifier'}` };
  if (document.parameters.some((p) => p.name === to)) return { ok: false, message: `"${to}" is already a parameter` };
  const other = document.cells.find((c) => c.id !== cellId && c.name === to);
  if (other) return { ok: false, message: `"${to}" is already the name of another cell` };

  const changedCells: string[] = [];
  const cells = document.cells.map((cell) => {
    if (cell.id === cellId) return { ...cell, name: to };
    const next = renameReferences(cell, from, to);
    if (next !== cell) changedCells.push(cell.id);
    return next;
  });
  return { ok: true, document: { ...document, cells }, changedCells };
}
