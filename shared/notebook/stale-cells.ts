import type { NotebookCell, NotebookDocument } from './document.js';

const WORD = /"(?:[^"\\]|\\.)*"|'(?:[^'\\]|\\.)*'|#[^\n]*|[A-Za-z_][A-Za-z0-9_]*/g;

/** Whole words of a formula outside strings and comments, not after a dot. */
function words(source: string): Set<string> {
  const out = new Set<string>();
  for (let m = WORD.exec(source); m !== null; m = WORD.exec(source)) {
    const w = m[0];
    if (w.startsWith('"') || w.startsWith("'") || w.startsWith('#')) continue;
    if (source.slice(0, m.index).trimEnd().endsWith('.')) continue;
    out.add(w);
  }
  return out;
}

/** Names a formula assigns at the start of a line (`bias = ...`, not `a == b`). */
export function assignedNames(source: string): string[] {
  const out: string[] = [];
  for (const line of source.split('\n')) {
    const m = /^\s*([A-Za-z_][A-Za-z0-9_]*)\s*=(?!=)/.exec(line);
    if (m) out.push(m[1]!);
  }
  return out;
}

/**
 * The names a cell may read, found without parsing: transform sources, and every free
 * word of its formulas. A word that is a function or unit simply matches no cell, so the
 * answer errs on the side of "depends" - right for marking cells as needing a rerun.
 */
export function roughReads(cell: NotebookCell): Set<string> {
  switch (cell.kind) {
    case 'transform': {
      const c = cell.config;
      return new Set(c.op === 'align' ? [c.reference, c.test] : c.op === 'combine' ? c.sources : [c.source]);
    }
    case 'formula':
      return words(cell.config.source);
    case 'chart':
      return new Set(Object.values(cell.config.bindings).flatMap((b) => [...words(b)]));
    default:
      return new Set();
  }
}

const contents = new WeakMap<NotebookCell, string>();
const reads = new WeakMap<NotebookCell, ReadonlySet<string>>();

function readsOf(cell: NotebookCell): ReadonlySet<string> {
  let r = reads.get(cell);
  if (r === undefined) reads.set(cell, (r = roughReads(cell)));
  return r;
}

/**
 * What a cell's result depends on in itself: everything but display state like `collapsed`.
 * Documents are replaced, never changed, so an unchanged cell is the same object and its
 * content is worked out once (the page asks on every keystroke).
 */
function contentOf(cell: NotebookCell): string {
  let content = contents.get(cell);
  if (content === undefined) contents.set(cell, (content = JSON.stringify([cell.kind, cell.name, cell.config])));
  return content;
}

/**
 * Ids of the cells whose result an edit from `before` to `after` makes out of date: cells
 * whose own content changed, cells reading a changed parameter or a re-bound slot, and
 * everything downstream of those (by {@link roughReads}), in document order. The host
 * shows these as "needs rerun" until the runner has recomputed them.
 *
 * @example staleCells(doc, { ...doc, parameters: [{ name: 'tolerance', value: 1.5 }] }) // ['bars']
 */
export function staleCells(before: NotebookDocument, after: NotebookDocument): string[] {
  const old = new Map(before.cells.map((c) => [c.id, contentOf(c)]));
  const oldParams = new Map(before.parameters.map((p) => [p.name, p.value]));
  const changedParams = new Set(after.parameters.filter((p) => oldParams.get(p.name) !== p.value).map((p) => p.name));
  for (const p of before.parameters) if (!after.parameters.some((q) => q.name === p.name)) changedParams.add(p.name);
  const oldSlots = new Map(before.slots.map((s) => [s.name, JSON.stringify([s.uploadId, s.csvMapping ?? null])]));
  const changedSlots = new Set(after.slots.filter((s) => oldSlots.get(s.name) !== JSON.stringify([s.uploadId, s.csvMapping ?? null])).map((s) => s.name));

  const dirtyNames = new Set<string>(changedParams);
  const stale: string[] = [];
  // Cells may read cells further down the document; repeat until nothing new is found.
  for (let pass = 0, grew = true; grew && pass < after.cells.length + 1; pass++) {
    grew = false;
    for (const cell of after.cells) {
      if (stale.includes(cell.id)) continue;
      const hit =
        old.get(cell.id) !== contentOf(cell) ||
        (cell.kind === 'import' && changedSlots.has(cell.config.slot)) ||
        [...readsOf(cell)].some((n) => dirtyNames.has(n));
      if (!hit) continue;
      stale.push(cell.id);
      dirtyNames.add(cell.name);
      if (cell.kind === 'formula') for (const n of assignedNames(cell.config.source)) dirtyNames.add(n);
      grew = true;
    }
  }
  const order = new Map(after.cells.map((c, i) => [c.id, i]));
  return stale.sort((a, b) => order.get(a)! - order.get(b)!);
}
