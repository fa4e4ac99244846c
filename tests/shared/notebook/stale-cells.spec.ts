import { describe, expect, it } from 'vitest';
import { createFormulaEngine } from '../../../shared/formula/index.js';
import { buildGraph, dependentsOf } from '../../../shared/notebook/index.js';
import { staleCells } from '../../../shared/notebook/stale-cells.js';
import { formula, notebook } from './notebook-builders.js';

function doc() {
  return notebook([
    { id: 'ref', kind: 'import', config: { slot: 'reference' } },
    { id: 'dut', kind: 'import', config: { slot: 'dut' } },
    { id: 'aligned', kind: 'transform', config: { op: 'align', reference: 'ref', test: 'dut' } },
    formula('stats', 'p = pctdiff(aligned.test_power, aligned.ref_power)'),
    formula('verdict', 'ok = abs(p) <= tolerance'),
    { id: 'plot', kind: 'chart', config: { preset: 'bland-altman', bindings: { ref: 'aligned.ref_power', test: 'aligned.test_power' } } },
  ]);
}

describe('staleCells', () => {
  it('marks a changed parameter\'s readers and nothing else', () => {
    const before = doc();
    const after = { ...before, parameters: [{ name: 'tolerance', value: 1.5 }] };
    expect(staleCells(before, after)).toEqual(['verdict']);
  });

  it('agrees with the dependency graph when a transform changes', () => {
    const before = doc();
    const cells = before.cells.map((c) => (c.id === 'aligned' && c.kind === 'transform' ? { ...c, config: { ...c.config, maxLagS: 60 } } : c));
    const after = { ...before, cells };
    // The parsed graph is the authority; the rough reading must find the same cells.
    const graph = buildGraph(after, createFormulaEngine());
    expect(staleCells(before, after)).toEqual(['aligned', ...dependentsOf(graph, 'aligned')]);
  });

  it('marks an import and its dependents when its slot gets another file, but not for collapsing', () => {
    const before = doc();
    const after = { ...before, slots: before.slots.map((s) => (s.name === 'dut' ? { ...s, uploadId: 'u2' } : s)) };
    expect(staleCells(before, after)).toEqual(['dut', 'aligned', 'stats', 'verdict', 'plot']);
    const collapsed = { ...before, cells: before.cells.map((c) => ({ ...c, collapsed: true })) };
    expect(staleCells(before, collapsed)).toEqual([]);
  });
});
