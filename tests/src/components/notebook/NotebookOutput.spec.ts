import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import { reactive } from 'vue';
import type { CellOutput } from '../../../../shared/notebook/cell-output.js';
import type { NotebookCell } from '../../../../shared/notebook/document.js';
import NotebookOutput from '@/components/notebook/NotebookOutput.vue';
import { NOTEBOOK_CONTEXT, type NotebookContext } from '@/components/notebook/context';
import { cellStatus } from '@/stores/notebookCellStatus';

const cell: NotebookCell = { id: 'c2', name: 'aligned', kind: 'formula', config: { source: 'p = 1' } };
const idle = { stale: false, computing: false, queued: false, runs: 1 };
const blocked: CellOutput = {
  cellId: 'c2', name: 'aligned', kind: 'formula', state: 'blocked', durationMs: 0, cached: false, warnings: [],
  blockedBy: { name: 'test', reason: 'empty_slot' },
};

/** The blocked cell's sentence when the input "test" is in the given state (or no notebook page around it). */
function sentence(slotState?: string): string {
  const inputs = { slots: reactive(slotState ? { test: { state: slotState, uploadId: null, warnings: [] } } : {}) };
  const global = slotState ? { provide: { [NOTEBOOK_CONTEXT as symbol]: { engine: {}, inputs } as unknown as NotebookContext } } : {};
  const wrapper = mount(NotebookOutput, { props: { cell, output: blocked, status: cellStatus(cell, blocked, idle) }, global });
  return wrapper.get('.cell-output__blocked').text().replace(/\s+/g, ' ');
}

describe('NotebookOutput, a cell waiting on an input', () => {
  it('asks for a file when the input is empty, or when no notebook page is around it', () => {
    expect(sentence('empty')).toBe('Waiting for a file: drop a FIT or CSV file on the input test.');
    expect(sentence()).toBe('Waiting for a file: drop a FIT or CSV file on the input test.');
  });

  it('does not ask for a file when the input has one that failed, needs mapping or is loading', () => {
    expect(sentence('failed')).toMatch(/^The file on the input test could not be read .*another FIT or CSV file\.$/);
    expect(sentence('needs-mapping')).toBe('Waiting for the columns of the file on the input test to be mapped.');
    expect(sentence('loading')).toBe('Reading the file on the input test…');
  });
});
