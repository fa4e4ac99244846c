import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import type { Snapshot } from '../../../../shared/api/snapshots.js';
import SnapshotView from '@/components/snapshot/SnapshotView.vue';

const snapshot: Snapshot = {
  snapshotVersion: 1,
  revision: 4,
  computedAt: '2026-03-01T10:00:00Z',
  durationMs: 1200,
  inputs: [
    { slot: 'reference', label: 'Reference pedals', fileName: 'ref.fit', format: 'fit', sha256: 'a'.repeat(64), size: 1000 },
    { slot: 'test', label: 'Crank', fileName: 'dut.fit', format: 'fit', sha256: 'b'.repeat(64), size: 1000 },
  ],
  cells: [
    { cellId: 'n1', name: 'finding', kind: 'note', state: 'fresh', durationMs: 0, result: { type: 'note', markdown: '## Finding\n\nLeft reads **+8%**.' }, warnings: [] },
    { cellId: 'f1', name: 'legs', kind: 'formula', state: 'fresh', durationMs: 3, result: { type: 'values', values: { left_big: 8.0581, mask: [true, false] } }, warnings: [] },
    {
      cellId: 't1',
      name: 'aligned',
      kind: 'transform',
      state: 'fresh',
      durationMs: 9,
      result: {
        type: 'table',
        table: { rows: 3300, startS: 0, endS: 3299, intervalS: 1, columns: [{ name: 'ref_power', n: 3300, missing: 0, mean: 196.6, min: 109, max: 369 }] },
        head: { columns: ['time', 'ref_power'], rows: [[0, 150], [1, 151]] },
      },
      warnings: [],
    },
    { cellId: 'c1', name: 'leg_bars', kind: 'chart', state: 'fresh', durationMs: 2, result: { type: 'chart', spec: { title: 'Difference by leg', mark: 'bar' } }, warnings: [] },
    { cellId: 'x1', name: 'broken', kind: 'formula', state: 'failed', durationMs: 0, error: { code: 'formula_syntax', message: 'unexpected “)” at line 2' }, warnings: [] },
  ],
};

function mountView() {
  return mount(SnapshotView, { props: { snapshot }, global: { stubs: { ChartView: { props: ['spec', 'name'], template: '<figure class="chart-stub">{{ name }}</figure>' } } } });
}

describe('SnapshotView', () => {
  it('shows every cell in order: the note as safe text, numbers, the table summary, the chart and the failure', () => {
    const wrapper = mountView();

    expect(wrapper.findAll('[data-snapshot-cell]').map((c) => c.attributes('data-snapshot-cell'))).toEqual(['finding', 'legs', 'aligned', 'leg_bars', 'broken']);
    const note = wrapper.get('[data-snapshot-cell=finding]');
    // Sanitising is renderMarkdown's (tested in useMarkdown.spec.ts, whose DOM fix this file lacks).
    expect(note.text()).toContain('Finding');
    expect(note.find('strong').text()).toBe('+8%');
    expect(wrapper.get('[data-value-name=left_big]').text()).toBe('8.058');
    expect(wrapper.get('[data-snapshot-cell=aligned]').text()).toContain('A table of 3,300 rows · 54:59 at 1 s, 1 columns');
    expect(wrapper.findAll('.chart-stub')).toHaveLength(1);
    expect(wrapper.get('[data-snapshot-cell=broken]').text()).toContain('unexpected “)” at line 2');
  });

  it('folds lists under the single numbers and names what it was computed from', () => {
    const wrapper = mountView();

    const lists = wrapper.get('[data-snapshot-cell=legs] details');
    expect(lists.attributes('open')).toBeUndefined();
    expect(lists.find('summary').text()).toBe('1 list: mask');
    expect(wrapper.text()).toContain('from revision 4');
    expect(wrapper.text()).toContain('ref.fit (Reference pedals) and dut.fit (Crank)');
  });

  it('offers jumps to the headed notes and the charts', () => {
    const links = mountView().findAll('nav a');

    expect(links.map((a) => [a.text(), a.attributes('href')])).toEqual([
      ['Finding', '#snap-n1'],
      ['Difference by leg', '#snap-c1'],
    ]);
  });
});
