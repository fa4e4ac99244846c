import { describe, expect, it } from 'vitest';
import { createFormulaEngine } from '../../../shared/formula/index.js';
import { runNotebook, staleCells } from '../../../shared/notebook/index.js';
import { formula, notebook, recording } from './notebook-builders.js';

const engine = createFormulaEngine();

describe('runNotebook', () => {
  const cells = [formula('a', 'x = 2'), formula('b', 'y = x * 3'), formula('c', 'z = y + 1'), formula('d', 'w = 10')];

  it('computes every cell in order and shows their values', () => {
    const r = runNotebook(notebook(cells), {}, undefined, { engine });
    expect(r.computed).toEqual(['a', 'b', 'c', 'd']);
    expect(r.outputs['c']).toMatchObject({ state: 'fresh', cached: false, result: { type: 'values', values: { z: 7 } } });
  });

  it('recomputes only the changed cell and what depends on it', () => {
    const first = runNotebook(notebook(cells), {}, undefined, { engine });
    const edited = [formula('a', 'x = 2'), formula('b', 'y = x * 4'), cells[2]!, cells[3]!];
    const second = runNotebook(notebook(edited), {}, first.cache, { engine });
    expect(second.computed).toEqual(['b', 'c']);
    expect(second.outputs['a']!.cached).toBe(true);
    expect(second.outputs['d']!.cached).toBe(true);
    expect(second.outputs['c']!.result).toMatchObject({ values: { z: 9 } });
  });

  it('lists as stale exactly the cells the next run computes', () => {
    const first = runNotebook(notebook(cells), {}, undefined, { engine });
    const edited = notebook([formula('a', 'x = 2'), formula('b', 'y = x * 4'), cells[2]!, cells[3]!]);
    const stale = staleCells(edited, {}, first.cache, { engine });
    expect(stale).toEqual(['b', 'c']);
    expect(runNotebook(edited, {}, first.cache, { engine }).computed).toEqual(stale);
    expect(staleCells(edited, {}, undefined, { engine })).toEqual(['a', 'b', 'c', 'd']);
  });

  it('reuses everything when nothing changed', () => {
    const first = runNotebook(notebook(cells), {}, undefined, { engine });
    const again = runNotebook(notebook(cells), {}, first.cache, { engine });
    expect(again.computed).toEqual([]);
    expect(Object.values(again.outputs).every((o) => o.cached && o.state === 'fresh')).toBe(true);
  });

  it('recomputes the readers of a parameter when its value changes, and only those', () => {
    const doc = (tol: number) =>
      notebook([formula('a', 'x = tolerance * 2'), formula('b', 'y = 1')], { parameters: [{ name: 'tolerance', value: tol }] });
    const first = runNotebook(doc(2), {}, undefined, { engine });
    const second = runNotebook(doc(1.5), {}, first.cache, { engine });
    expect(second.computed).toEqual(['a']);
    expect(second.outputs['a']!.result).toMatchObject({ values: { x: 3 } });
  });

  it('blocks the cells downstream of a failed cell and names it', () => {
    const doc = notebook([formula('a', 'x = [1, 2] + [1, 2, 3]'), formula('b', 'y = x + 1'), formula('c', 'z = y + 1'), formula('d', 'w = 1')]);
    const r = runNotebook(doc, {}, undefined, { engine });
    expect(r.outputs['a']).toMatchObject({ state: 'failed', error: { where: { cell: 'a', line: 1 } } });
    expect(r.outputs['b']).toMatchObject({ state: 'blocked', blockedBy: { cellId: 'a', name: 'a', reason: 'failed' } });
    expect(r.outputs['c']).toMatchObject({ state: 'blocked', blockedBy: { cellId: 'a', reason: 'failed' } });
    expect(r.outputs['d']!.state).toBe('fresh');
  });

  it('blocks cells in and after a cycle', () => {
    const r = runNotebook(notebook([formula('a', 'x = y'), formula('b', 'y = x'), formula('c', 'z = x')]), {}, undefined, { engine });
    expect(r.outputs['a']!.error?.code).toBe('notebook_cycle');
    expect(r.outputs['c']!.state).toBe('blocked');
  });

  it('waits on an empty slot, and reads the recording once bound', () => {
    const doc = notebook([{ id: 'ref', kind: 'import', config: { slot: 'reference' } }, formula('m', 'mean_power = avg(ref.power)')]);
    const empty = runNotebook(doc, {}, undefined, { engine });
    expect(empty.outputs['ref']).toMatchObject({ state: 'blocked', blockedBy: { name: 'reference', reason: 'empty_slot' } });
    expect(empty.outputs['m']).toMatchObject({ state: 'blocked', blockedBy: { reason: 'empty_slot' } });
    const bound = runNotebook(doc, { reference: recording([100, 200, NaN, 300]) }, empty.cache, { engine });
    expect(bound.outputs['m']!.result).toMatchObject({ values: { mean_power: 200 } });
    expect(bound.outputs['ref']!.result).toMatchObject({ type: 'recording', recording: { rows: 4 } });
  });

  it('recomputes when a different recording is bound to the slot', () => {
    const doc = notebook([{ id: 'ref', kind: 'import', config: { slot: 'reference' } }, formula('m', 'p = avg(ref.power)')]);
    const first = runNotebook(doc, { reference: recording([100, 200]) }, undefined, { engine });
    const same = runNotebook(doc, { reference: recording([100, 200]) }, first.cache, { engine });
    expect(same.computed).toEqual([]);
    const other = runNotebook(doc, { reference: recording([100, 300]) }, first.cache, { engine });
    expect(other.computed).toEqual(['ref', 'm']);
  });

  it('lets a formula read another formula cell by its cell name', () => {
    const r = runNotebook(notebook([formula('stats', 'bias = 2\nsd = 3'), formula('use', 'k = stats.bias + sd')]), {}, undefined, { engine });
    expect(r.outputs['use']!.result).toMatchObject({ values: { k: 5 } });
  });

  it('reports the time each computed cell took and which cell starts', () => {
    let clock = 0;
    const started: string[] = [];
    const r = runNotebook(notebook(cells), {}, undefined, { engine, now: () => (clock += 5), onCellStart: (id) => started.push(id) });
    expect(started).toEqual(['a', 'b', 'c', 'd']);
    expect(r.outputs['a']!.durationMs).toBeGreaterThan(0);
  });

  it('stops a formula that runs past the cell time limit', () => {
    let clock = 0;
    const doc = notebook([formula('slow', 'f(n) = n < 1 ? 0 : f(n - 1) + f(n - 1)\nv = f(40)')]);
    const r = runNotebook(doc, {}, undefined, { engine, now: () => (clock += 1), cellTimeLimitMs: 100 });
    expect(r.outputs['slow']).toMatchObject({ state: 'failed', error: { code: 'formula_timeout', where: { cell: 'slow', line: 2 } } });
  });

  it('does not compute a cell the host stopped earlier, fails it with the given error and blocks its readers', () => {
    const doc = notebook([formula('a', 'x = 2'), formula('b', 'y = x * 3'), formula('c', 'z = y + 1'), formula('d', 'w = 10')]);
    const error = { code: 'run_timeout', message: 'stopped after 30 s', where: { cell: 'b' } };
    const r = runNotebook(doc, {}, undefined, { engine, stopped: { b: error } });
    expect(r.computed).toEqual(['a', 'd']);
    expect(r.outputs['b']).toMatchObject({ state: 'failed', error });
    expect(r.outputs['c']).toMatchObject({ state: 'blocked', blockedBy: { cellId: 'b', reason: 'failed' } });
    expect(r.outputs['d']).toMatchObject({ state: 'fresh', result: { values: { w: 10 } } });
  });

  it('passes note markdown through for the client to render', () => {
    const r = runNotebook(notebook([{ id: 'n', kind: 'note', config: { markdown: '# Findings' } }]), {}, undefined, { engine });
    expect(r.outputs['n']!.result).toEqual({ type: 'note', markdown: '# Findings' });
  });
});
