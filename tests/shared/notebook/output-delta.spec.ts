import { describe, expect, it } from 'vitest';
import { createFormulaEngine } from '../../../shared/formula/index.js';
import { runNotebook } from '../../../shared/notebook/index.js';
import { createOutputLedger, mergeOutputs } from '../../../shared/notebook/output-delta.js';
import { formula, notebook } from './notebook-builders.js';

const engine = createFormulaEngine();
const cells = [formula('a', 'x = 2'), formula('b', 'y = x * 3'), formula('c', 'z = y + 1'), formula('d', 'w = 10')];
const edited = [cells[0]!, formula('b', 'y = x * 4'), cells[2]!, cells[3]!];

describe('output delta across the worker boundary', () => {
  it('sends everything the first time and numbers every fresh output', () => {
    const ledger = createOutputLedger();
    const run = runNotebook(notebook(cells), {}, undefined, { engine });
    const delta = ledger.delta(run.outputs, run.cache);
    expect(Object.keys(delta.outputs)).toEqual(['a', 'b', 'c', 'd']);
    expect(delta.kept).toEqual([]);
    expect(new Set(Object.values(delta.serials)).size).toBe(4);
  });

  it('names only the unchanged cells the page holds, and the merge keeps the page’s objects', () => {
    const ledger = createOutputLedger();
    const first = runNotebook(notebook(cells), {}, undefined, { engine });
    const d1 = ledger.delta(first.outputs, first.cache);
    const page1 = mergeOutputs({}, d1, first.order);
    const second = runNotebook(notebook(edited), {}, first.cache, { engine });
    const d2 = ledger.delta(second.outputs, second.cache, d1.serials);
    expect(d2.kept.sort()).toEqual(['a', 'd']);
    expect(Object.keys(d2.outputs).sort()).toEqual(['b', 'c']);
    const page2 = mergeOutputs(page1, d2, second.order);
    // The kept cells' results are the very objects the page had (a chart is not drawn again).
    expect(page2['a']!.result).toBe(page1['a']!.result);
    expect(page2['d']!.result).toBe(page1['d']!.result);
    expect(page2['a']).toMatchObject({ cached: true, durationMs: 0, state: 'fresh' });
    expect(page2['c']!.result).toMatchObject({ values: { z: 9 } });
    expect(Object.keys(page2)).toEqual(['a', 'b', 'c', 'd']);
    // A third identical run keeps even the wrappers.
    const third = runNotebook(notebook(edited), {}, second.cache, { engine });
    const d3 = ledger.delta(third.outputs, third.cache, d2.serials);
    expect(d3.kept.sort()).toEqual(['a', 'b', 'c', 'd']);
    const page3 = mergeOutputs(page2, d3, third.order);
    expect(page3['a']).toBe(page2['a']);
  });

  it('sends a cached output in full when the page does not hold that serial', () => {
    const ledger = createOutputLedger();
    const first = runNotebook(notebook(cells), {}, undefined, { engine });
    const d1 = ledger.delta(first.outputs, first.cache);
    const second = runNotebook(notebook(cells), {}, first.cache, { engine });
    const wrong = { ...d1.serials, a: d1.serials['a']! + 100 };
    delete (wrong as Record<string, number>)['d'];
    const d2 = ledger.delta(second.outputs, second.cache, wrong);
    expect(Object.keys(d2.outputs).sort()).toEqual(['a', 'd']);
    expect(d2.kept.sort()).toEqual(['b', 'c']);
    expect(d2.serials).toEqual(d1.serials);
  });

  it('always sends failed and blocked cells, and refuses to keep what the page lacks', () => {
    const ledger = createOutputLedger();
    const broken = [formula('a', 'x = nothere + 1'), formula('b', 'y = x * 3')];
    const run = runNotebook(notebook(broken), {}, undefined, { engine });
    const d = ledger.delta(run.outputs, run.cache, { a: 1, b: 2 });
    expect(d.kept).toEqual([]);
    expect(d.outputs['a']!.state).toBe('failed');
    expect(d.outputs['b']!.state).toBe('blocked');
    expect(d.serials).toEqual({});
    expect(() => mergeOutputs({}, { outputs: {}, kept: ['a'] }, ['a'])).toThrow(/does not hold/);
  });
});
