import type { NotebookDocument } from '../../../shared/notebook/document.js';
import { chartCell, formulaCell, importCell, transformCell } from '../../../shared/demo/cells.js';
import { notebookDoc } from './fixtures.js';

/**
 * A small recipe: two input slots (reference, test), their import cells, a resampled
 * table, a formula with the mean of each and their difference in percent, and a chart.
 */
export function recipeDoc(uploads: { reference: string | null; test: string | null }, title = 'Mean power, reference vs device'): NotebookDocument {
  return notebookDoc({
    title,
    slots: [
      { id: 'reference', name: 'reference', label: 'Reference hub', uploadId: uploads.reference },
      { id: 'test', name: 'test', label: 'Crank under test', uploadId: uploads.test },
    ],
    cells: [
      importCell('c1', 'ref', 'reference'),
      importCell('c2', 'dut', 'test'),
      transformCell('c3', 'grid', { op: 'resample', source: 'ref', intervalS: 1 }),
      formulaCell('c4', 'stats', ['ref_mean = mean(ref.power)', 'dut_mean = mean(dut.power)', 'diff_pct = (dut_mean - ref_mean) / ref_mean * 100']),
      chartCell('c5', 'trace', 'traces', { x: 'ref.time', y1: 'ref.power', y2: 'dut.power' }),
    ],
  });
}
