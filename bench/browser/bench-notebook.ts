import { chartCell, formulaCell, importCell, noteCell, transformCell } from '../../shared/demo/cells.js';
import { perLegByChainringCells, perLegParameters } from '../../shared/demo/chains/per-leg-by-chainring.js';
import { NOTEBOOK_SCHEMA_VERSION, notebookDocumentSchema, type NotebookDocument } from '../../shared/notebook/document.js';
import type { Recording } from '../../shared/recording/recording.js';
import { writeCsv } from '../../shared/recording/write-csv.js';
import { writeFit } from '../../shared/recording/write-fit.js';
import { defaultProtocol, deviceView, synthesizeRide, type SyntheticDevice } from '../../shared/synthetic/index.js';

/** One file to upload: its name and bytes. */
export interface BenchFile {
  slot: 'reference' | 'test' | 'test_b';
  fileName: string;
  bytes: Uint8Array;
  samples: number;
}

/** The formula cell the edit benchmark types into, and the line it edits (the first). */
export const EDITED_CELL_ID = 'bench-edit';
const EDITED_LINES = (rows: 'big' | 'tiny'): string[] =>
  rows === 'big'
    ? [
        'pedal_min = 5',
        'pedalling = aligned.cadence > pedal_min',
        'ride_pct = pctdiff(aligned.test_power, aligned.ref_power, pedalling)',
        'ba = agreement(aligned.test_power, aligned.ref_power, pedalling)',
        'b_pct = pctdiff(aligned_b.test_power, aligned_b.ref_power, aligned_b.cadence > pedal_min)',
        'b_pedalling_share = mean(dut_b_5s.cadence > pedal_min)',
      ]
    : ['pedal_min = 5', 'doubled = 2 * pedal_min'];

const REFERENCE: SyntheticDevice = { label: 'Bench reference pedals', serialNumber: 8101, noiseSdW: 3, smoothingS: 1 };
const DEVICE_A: SyntheticDevice = {
  label: 'Bench crank A', serialNumber: 8102, noiseSdW: 4, smoothingS: 2, gains: { left: [1, 1.06], right: [1, 1] }, clockOffsetS: 4,
  dropouts: { perHour: 10, meanLengthS: 3, style: 'missing' },
};
const DEVICE_B: SyntheticDevice = {
  label: 'Bench spider B', serialNumber: 8103, noiseSdW: 2.5, balance: 'none', gains: { left: [1.012, 1.012], right: [1.012, 1.012] }, clockOffsetS: -3, driftWPerH: 1,
};

/**
 * Three recordings of one seeded ride (the default protocol repeated `hours` times): a
 * reference and two devices under test. At 1 Hz the reference and device A are FIT and
 * device B is CSV (a mixed lab); at 10 Hz all three are CSV (FIT holds whole seconds).
 */
export function benchFiles(hours: number, rateHz: 1 | 10): BenchFile[] {
  const blocks = Array.from({ length: hours }, () => defaultProtocol()).flat();
  const ride = synthesizeRide({ seed: 20260411 + rateHz, rateHz, blocks });
  const intervalS = 1 / rateHz;
  const view = (d: SyntheticDevice): Recording => deviceView(ride, { ...d, intervalS }).recording;
  const fit = rateHz === 1;
  const file = (slot: BenchFile['slot'], d: SyntheticDevice, asFit: boolean): BenchFile => {
    const r = view(d);
    const stem = `${d.label.toLowerCase().replace(/\s+/g, '-')}-${hours}h-${rateHz}hz`;
    const bytes = asFit ? writeFit(r) : new TextEncoder().encode(writeCsv(r, { omitLegs: d.balance === 'none' }));
    return { slot, fileName: `${stem}.${asFit ? 'fit' : 'csv'}`, bytes, samples: r.time.length };
  };
  return [file('reference', REFERENCE, fit), file('test', DEVICE_A, fit), file('test_b', DEVICE_B, false)];
}

/**
 * The benchmark notebook (14 cells) over three bound uploads: the demo's per-leg,
 * per-chainring chain for device A (import x2, align, steady blocks, gear state, two
 * formulas, bars against the tolerance, Bland-Altman), then device B imported, aligned and
 * charted as a difference over time, its file also resampled to 5 s, and the formula cell
 * the edit benchmark changes (reads both aligned tables and the resampled one).
 */
export function benchNotebook(title: string, uploads: Record<BenchFile['slot'], string>): NotebookDocument {
  return notebookDocumentSchema.parse({
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title,
    description: 'Benchmark notebook: one reference and two devices under test over the same ride.',
    parameters: perLegParameters(2, { small: 34, big: 50 }),
    slots: [
      { id: 'reference', name: 'reference', label: REFERENCE.label, uploadId: uploads.reference },
      { id: 'test', name: 'test', label: DEVICE_A.label, uploadId: uploads.test },
      { id: 'test_b', name: 'test_b', label: DEVICE_B.label, uploadId: uploads.test_b },
    ],
    cells: [
      ...perLegByChainringCells(DEVICE_A.label),
      importCell('import-test-b', 'dut_b', 'test_b'),
      transformCell('align-b', 'aligned_b', { op: 'align', reference: 'ref', test: 'dut_b', mode: 'auto', maxLagS: 120 }),
      transformCell('resample-b', 'dut_b_5s', { op: 'resample', source: 'dut_b', intervalS: 5 }),
      chartCell(
        'difference-b',
        'difference_b',
        'difference',
        { x: 'aligned_b.time', test: 'rollavg(aligned_b.test_power, 60)', ref: 'rollavg(aligned_b.ref_power, 60)' },
        { title: 'Device B against the reference over time', labels: [DEVICE_B.label] },
      ),
      formulaCell(EDITED_CELL_ID, 'pedalling_check', EDITED_LINES('big')),
    ],
  });
}

/** The baseline notebook: no recordings, one note and the same kind of formula cell to edit. */
export function tinyNotebook(title: string): NotebookDocument {
  return notebookDocumentSchema.parse({
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title,
    description: 'Benchmark baseline: nothing to compute but the edited cell.',
    parameters: [],
    slots: [],
    cells: [noteCell('about', 'about', 'Nothing here reads a recording.'), formulaCell(EDITED_CELL_ID, 'pedalling_check', EDITED_LINES('tiny'))],
  });
}
