import { describe, expect, it } from 'vitest';
import { createFormulaEngine } from '../../../shared/formula/index.js';
import { buildGraph, dependentsOf } from '../../../shared/notebook/index.js';
import { formula, notebook } from './notebook-builders.js';

const engine = createFormulaEngine();

describe('buildGraph', () => {
  it('orders cells after what they read, document order where free', () => {
    const doc = notebook([formula('c', 'z = y + x'), formula('a', 'x = 1'), formula('b', 'y = x * 2'), formula('d', 'w = 5')]);
    const g = buildGraph(doc, engine);
    expect(g.order).toEqual(['a', 'b', 'c', 'd']);
    expect(g.cells['c']!.dependsOn.sort()).toEqual(['a', 'b']);
    expect(g.producers).toMatchObject({ x: 'a', y: 'b', z: 'c', w: 'd' });
  });

  it('reads transform sources and parameters', () => {
    const doc = notebook([
      { id: 'ref', kind: 'import', config: { slot: 'reference' } },
      { id: 'dut', kind: 'import', config: { slot: 'dut' } },
      { id: 'aligned', kind: 'transform', config: { op: 'align', reference: 'ref', test: 'dut' } },
      formula('stats', 'p = pctdiff(aligned.test_power, aligned.ref_power)\nok = abs(p) <= tolerance'),
    ]);
    const g = buildGraph(doc, engine);
    expect(g.cells['aligned']!.dependsOn).toEqual(['ref', 'dut']);
    expect(g.cells['stats']!.dependsOn).toEqual(['aligned']);
    expect(g.cells['stats']!.parameters).toEqual(['tolerance']);
    expect(dependentsOf(g, 'dut')).toEqual(['aligned', 'stats']);
  });

  it('names the cycle in its message', () => {
    const doc = notebook([formula('a', 'x = z + 1'), formula('b', 'y = x + 1'), formula('c', 'z = y + 1'), formula('d', 'w = 1')]);
    const g = buildGraph(doc, engine);
    expect(g.cycles).toHaveLength(1);
    expect(g.order).toEqual(['d', 'a', 'b', 'c']);
    const err = g.cells['a']!.error!;
    expect(err.code).toBe('notebook_cycle');
    expect(err.message).toContain('a -> c -> b -> a');
    expect(g.cells['d']!.error).toBeUndefined();
  });

  it('refuses a name given by two cells, pointing at the second', () => {
    const doc = notebook([formula('a', 'bias = 1'), formula('b', 'x = 2\nbias = 3')]);
    const err = buildGraph(doc, engine).cells['b']!.error!;
    expect(err.code).toBe('name_taken');
    expect(err.message).toContain('cell "a"');
    expect(err.where).toMatchObject({ cell: 'b', line: 2, column: 1 });
  });

  it('reports an unknown name with its position', () => {
    const err = buildGraph(notebook([formula('a', 'x = 1\ny = x + nope')]), engine).cells['a']!.error!;
    expect(err).toMatchObject({ code: 'formula_unknown_name', where: { cell: 'a', line: 2, column: 9 } });
  });

  it('reports a formula that does not parse without stopping the others', () => {
    const g = buildGraph(notebook([formula('a', 'x = (1 +'), formula('b', 'y = 2')]), engine);
    expect(g.cells['a']!.error?.code).toBe('formula_syntax');
    expect(g.cells['b']!.error).toBeUndefined();
  });
});
