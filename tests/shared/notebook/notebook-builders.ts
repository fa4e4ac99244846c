import { notebookDocumentSchema, type NotebookDocument } from '../../../shared/notebook/index.js';
import type { Recording } from '../../../shared/recording/recording.js';

type CellInput = { id: string; name?: string; kind: string; config: Record<string, unknown> };

/** A checked notebook document from a few cells; defaults fill the rest. */
export function notebook(cells: CellInput[], overrides: Partial<Omit<NotebookDocument, 'cells'>> = {}): NotebookDocument {
  return notebookDocumentSchema.parse({
    schemaVersion: 2,
    title: 'Test notebook',
    parameters: [{ name: 'tolerance', value: 2 }],
    slots: [
      { id: 's1', name: 'reference', label: 'Reference', uploadId: null },
      { id: 's2', name: 'dut', label: 'Device under test', uploadId: null },
    ],
    ...overrides,
    cells: cells.map((c) => ({ name: c.id, ...c })),
  });
}

/** A formula cell whose id is also its name. */
export const formula = (id: string, source: string): CellInput => ({ id, kind: 'formula', config: { source } });

/** A small recording on a 1 s grid with the given power (and optional cadence). */
export function recording(power: number[], extra: { cadence?: number[]; fileName?: string } = {}): Recording {
  const n = power.length;
  return {
    meta: {
      fileName: extra.fileName ?? 'ride.csv',
      format: 'csv',
      device: {},
      startMs: Date.UTC(2026, 2, 2, 9),
      sampleIntervalS: 1,
      totalS: n - 1,
      pausedS: 0,
      balanceSide: 'none',
      dropouts: power.filter((p) => Number.isNaN(p)).length,
    },
    time: Float64Array.from({ length: n }, (_, i) => i),
    columns: {
      power: Float64Array.from(power),
      ...(extra.cadence ? { cadence: Float64Array.from(extra.cadence) } : {}),
    },
    events: [],
    warnings: [],
  };
}
