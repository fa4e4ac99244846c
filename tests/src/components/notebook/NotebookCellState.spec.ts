import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import type { CellOutput } from '../../../../shared/notebook/cell-output.js';
import type { NotebookCell } from '../../../../shared/notebook/document.js';
import NotebookCellState from '@/components/notebook/NotebookCellState.vue';
import { cellStatus } from '@/stores/notebookCellStatus';

const cell: NotebookCell = { id: 'c4', name: 'stats', kind: 'formula', config: { source: 'p = 1' } };
const idle = { stale: false, computing: false, queued: false, runs: 1 };

function output(overrides: Partial<CellOutput>): CellOutput {
  return { cellId: 'c4', name: 'stats', kind: 'formula', state: 'fresh', durationMs: 840, cached: false, warnings: [], ...overrides };
}

function shown(status: ReturnType<typeof cellStatus>) {
  const wrapper = mount(NotebookCellState, { props: { status } });
  const root = wrapper.get('[data-state]');
  return { state: root.attributes('data-state'), text: root.text().replace(/\s*·\s*/, ' · ') };
}

describe('NotebookCellState', () => {
  it('shows an up-to-date cell with its compute time', () => {
    expect(shown(cellStatus(cell, output({}), idle))).toEqual({ state: 'fresh', text: 'up to date · 840 ms' });
    expect(shown(cellStatus(cell, output({ cached: true, durationMs: 0 }), idle)).text).toBe('up to date · reused');
  });

  it('says a cell needs a rerun after an edit, and computing while it runs', () => {
    expect(shown(cellStatus(cell, output({}), { ...idle, stale: true }))).toEqual({ state: 'stale', text: 'needs rerun' });
    expect(shown(cellStatus(cell, undefined, idle)).state).toBe('stale');
    expect(shown(cellStatus(cell, output({}), { ...idle, computing: true }))).toEqual({ state: 'running', text: 'computing' });
  });

  it('names the failed cell a blocked cell waits on, and the empty input', () => {
    const waiting = cellStatus(cell, output({ state: 'blocked', blockedBy: { cellId: 'c3', name: 'aligned', reason: 'failed' } }), idle);
    expect(shown(waiting)).toEqual({ state: 'blocked', text: 'waiting on aligned' });
    expect(waiting.detail).toContain('aligned');
    const empty = cellStatus(cell, output({ state: 'blocked', blockedBy: { name: 'reference', reason: 'empty_slot' } }), idle);
    expect(shown(empty).text).toBe('waiting for a file in reference');
  });

  it('keeps the failure message for the tooltip', () => {
    const failed = cellStatus(cell, output({ state: 'failed', error: { code: 'formula_unknown_name', message: 'unknown name "algned" at line 1, column 5', where: { cell: 'c4', line: 1, column: 5 } } }), idle);
    expect(shown(failed)).toEqual({ state: 'failed', text: 'failed' });
    expect(failed.detail).toBe('unknown name "algned" at line 1, column 5');
  });
});
