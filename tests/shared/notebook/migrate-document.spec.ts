import { describe, expect, it } from 'vitest';
import { NOTEBOOK_SCHEMA_VERSION, emptyNotebook, migrateNotebookDocument } from '../../../shared/notebook/index.js';

const v1 = {
  schemaVersion: 1,
  title: 'Crank vs hub, March',
  description: '',
  parameters: [{ name: 'tolerance', value: 1.5, unit: '%' }],
  slots: [{ id: 's1', name: 'reference', label: 'Reference hub', uploadId: null }],
  cells: [
    { id: 'c1', kind: 'import', name: 'ref', config: { slot: 'reference' } },
    { id: 'c2', kind: 'note', name: 'intro', config: { text: 'Steady blocks on the trainer.' } },
    { id: 'c3', kind: 'formula', name: 'stats', config: { expression: 'm = avg(ref.power)' } },
    { id: 'c4', kind: 'transform', name: 'grid', config: { op: 'resample', source: 'ref' } },
  ],
};

describe('migrateNotebookDocument', () => {
  it('brings a version 1 document to the current version, keeping its content', () => {
    const doc = migrateNotebookDocument(v1);
    expect(doc.schemaVersion).toBe(NOTEBOOK_SCHEMA_VERSION);
    expect(doc.cells.map((c) => c.config)).toEqual([
      { slot: 'reference' },
      { markdown: 'Steady blocks on the trainer.' },
      { source: 'm = avg(ref.power)' },
      { op: 'resample', source: 'ref', intervalS: 1, maxGapS: 3 },
    ]);
    expect(doc.parameters[0]!.value).toBe(1.5);
  });

  it('reads a document saved before versions existed', () => {
    const doc = migrateNotebookDocument({ title: 'Old', cells: [] });
    expect(doc).toMatchObject({ schemaVersion: NOTEBOOK_SCHEMA_VERSION, title: 'Old', parameters: [], slots: [], cells: [] });
  });

  it('accepts a current document unchanged', () => {
    const doc = emptyNotebook('New');
    expect(migrateNotebookDocument(doc)).toEqual(doc);
  });

  it('refuses a document from a newer Cogbook with a message saying so', () => {
    expect(() => migrateNotebookDocument({ ...emptyNotebook('Future'), schemaVersion: NOTEBOOK_SCHEMA_VERSION + 1 })).toThrow(
      expect.objectContaining({ code: 'notebook_too_new', message: expect.stringMatching(/format version 3.*reads up to version 2.*newer Cogbook/) }),
    );
  });

  it('names the field that fails the schema', () => {
    const bad = { ...v1, cells: [{ id: 'c1', kind: 'transform', name: 'x', config: { op: 'smooth' } }] };
    expect(() => migrateNotebookDocument(bad)).toThrow(expect.objectContaining({ code: 'notebook_invalid', message: expect.stringContaining('cells.0.config.source') }));
  });

  it('refuses what is not a notebook', () => {
    expect(() => migrateNotebookDocument([1, 2])).toThrow(expect.objectContaining({ code: 'notebook_invalid' }));
    expect(() => migrateNotebookDocument({ schemaVersion: 'two' })).toThrow(expect.objectContaining({ code: 'notebook_invalid' }));
  });
});
