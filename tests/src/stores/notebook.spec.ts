import { createPinia, setActivePinia } from 'pinia';
import { beforeEach, describe, expect, it } from 'vitest';
import type { NotebookResponse } from '../../../shared/api/notebooks.js';
import { notebookDocumentSchema, type NotebookDocument } from '../../../shared/notebook/document.js';
import { useNotebookStore } from '@/stores/notebook';

function response(document: Partial<NotebookDocument> = {}, edit = true): NotebookResponse {
  const doc = notebookDocumentSchema.parse({
    schemaVersion: 2,
    title: 'Crank against spider',
    parameters: [{ name: 'tolerance', value: 2, unit: '%' }],
    slots: [
      { id: 'reference', name: 'reference', label: 'Reference', uploadId: null },
      { id: 'test', name: 'test', label: 'Device under test', uploadId: null },
    ],
    cells: [
      { id: 'c1', name: 'ref', kind: 'import', config: { slot: 'reference' } },
      { id: 'c2', name: 'dut', kind: 'import', config: { slot: 'test' } },
      { id: 'c3', name: 'aligned', kind: 'transform', config: { op: 'align', reference: 'ref', test: 'dut' } },
      { id: 'c4', name: 'stats', kind: 'formula', config: { source: 'p = pctdiff(aligned.test_power, aligned.ref_power)\nok = abs(p) <= tolerance' } },
      { id: 'c5', name: 'plot', kind: 'chart', config: { preset: 'bland-altman', bindings: { ref: 'aligned.ref_power', test: 'aligned.test_power' } } },
    ],
    ...document,
  });
  return {
    notebook: {
      id: 'nb1',
      title: doc.title,
      workspace: { id: 'w1', name: 'Ridgeline lab' },
      owner: { id: 'u1', name: 'Sam' },
      role: edit ? 'owner' : 'viewer',
      permissions: { edit, manage: edit },
      revision: 3,
      forkedFrom: null,
      createdAt: '2026-03-02T09:00:00Z',
      updatedAt: '2026-03-02T09:00:00Z',
    },
    revision: 3,
    document: doc,
  };
}

const names = (store: ReturnType<typeof useNotebookStore>) => store.cells.map((c) => c.name);

describe('useNotebookStore', () => {
  beforeEach(() => setActivePinia(createPinia()));

  it('adds a cell after the focused one, reading the cells above it', () => {
    const store = useNotebookStore();
    store.load(response());
    store.focusedCellId = 'c3';
    const id = store.addCell('transform', { op: 'segment' })!;
    expect(names(store)).toEqual(['ref', 'dut', 'aligned', 'blocks', 'stats', 'plot']);
    const cell = store.cells.find((c) => c.id === id)!;
    expect(cell.kind === 'transform' && cell.config).toMatchObject({ op: 'segment', source: 'aligned', method: 'steady' });
    expect(store.saveState).toBe('unsaved');
  });

  it('adds an input slot when every slot already has its import cell', () => {
    const store = useNotebookStore();
    store.load(response());
    store.addCell('import', { index: 2 });
    expect(store.document!.slots.map((s) => s.name)).toEqual(['reference', 'test', 'test_2']);
    expect(store.cells[2]).toMatchObject({ kind: 'import', name: 'test_2', config: { slot: 'test_2' } });
  });

  it('moves, duplicates and deletes cells, and undoes and redoes each step', () => {
    const store = useNotebookStore();
    store.load(response());
    const original = names(store);
    store.moveCell('c5', -1);
    expect(names(store)).toEqual(['ref', 'dut', 'aligned', 'plot', 'stats']);
    store.moveCell('c1', -1); // already first: nothing happens, no undo step
    store.duplicateCell('c3');
    expect(names(store)).toEqual(['ref', 'dut', 'aligned', 'aligned_copy', 'plot', 'stats']);
    store.deleteCell('c1');
    expect(names(store)).toEqual(['dut', 'aligned', 'aligned_copy', 'plot', 'stats']);
    expect(store.undoStack.map((e) => e.label)).toEqual(['move cell up', 'duplicate cell', 'delete cell']);

    store.undo();
    store.undo();
    expect(names(store)).toEqual(['ref', 'dut', 'aligned', 'plot', 'stats']);
    store.undo();
    expect(names(store)).toEqual(original);
    expect(store.canUndo).toBe(false);
    store.redo();
    store.redo();
    expect(names(store)).toEqual(['ref', 'dut', 'aligned', 'aligned_copy', 'plot', 'stats']);
    // A new edit drops what could still be redone.
    store.setParameter('tolerance', 1.5);
    expect(store.canRedo).toBe(false);
  });

  it('renames an output and every later cell that reads it, undone in one step', () => {
    const store = useNotebookStore();
    store.load(response());
    expect(store.renameCell('c3', 'paired')).toBeNull();
    const [, , aligned, stats, plot] = store.cells;
    expect(aligned).toMatchObject({ name: 'paired' });
    expect(stats!.kind === 'formula' && stats!.config.source).toBe('p = pctdiff(paired.test_power, paired.ref_power)\nok = abs(p) <= tolerance');
    expect(plot!.kind === 'chart' && plot!.config.bindings).toEqual({ ref: 'paired.ref_power', test: 'paired.test_power' });
    expect(store.renameCell('c3', 'tolerance')).toMatch(/parameter/);
    store.undo();
    expect(store.cells[3]!.kind === 'formula' && store.cells[3]!.config.source).toContain('aligned.test_power');
  });

  it('merges quick successive edits of one field into one undo step', () => {
    const store = useNotebookStore();
    store.load(response());
    for (const source of ['p', 'p =', 'p = 1']) store.updateCell('c4', { config: { source } });
    expect(store.undoStack).toHaveLength(1);
    store.undo();
    expect(store.cells[3]!.kind === 'formula' && store.cells[3]!.config.source).toContain('pctdiff');
  });

  it('marks a changed parameter\'s readers as needing a rerun, and clears that when a run lands', () => {
    const store = useNotebookStore();
    store.load(response());
    store.runFinished({ outputs: {}, computed: [] });
    expect(store.stale.size).toBe(0);
    store.setParameter('tolerance', 1);
    expect([...store.stale]).toEqual(['c4']);
    store.runStarted();
    store.runFinished({ outputs: {}, computed: ['c4'] });
    expect(store.stale.size).toBe(0);
    expect(store.runCounts).toEqual({ c4: 1 });
  });

  it('changes nothing for a viewer', () => {
    const store = useNotebookStore();
    store.load(response({}, false));
    expect(store.readOnly).toBe(true);
    expect(store.addCell('note')).toBeNull();
    store.deleteCell('c1');
    store.setParameter('tolerance', 5);
    expect(names(store)).toEqual(['ref', 'dut', 'aligned', 'stats', 'plot']);
    expect(store.document!.parameters[0]!.value).toBe(2);
    expect(store.canUndo).toBe(false);
  });
});
