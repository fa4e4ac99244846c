import type { Segment } from '../engine/segment.js';
import type { Table } from '../engine/table.js';
import type { FormulaValue } from '../formula/formula-value.js';
import type { TopLevelSpec } from '../charts/spec.js';
import type { Recording } from '../recording/recording.js';

/** A table a transform made, with what later cells and reports need beside it. */
export interface NotebookTable {
  table: Table;
  /** Sections found by a segment transform (the `segment` column numbers them from 1). */
  segments?: Segment[];
  /** Laps of the recording the table came from, on the table's time axis. */
  laps?: Segment[];
  /** Numbers the transform worked out (e.g. offsetS, correlation of an alignment). */
  facts?: Record<string, number | string>;
}

/**
 * The full value of a cell, held in the run cache and read by later cells. Only the
 * runner sees it; what the UI gets is the summary in {@link CellOutput}.
 */
export type CellValue =
  | { kind: 'recording'; recording: Recording }
  | ({ kind: 'table' } & NotebookTable)
  | { kind: 'values'; values: Record<string, FormulaValue>; last?: FormulaValue }
  | { kind: 'chart'; spec: TopLevelSpec }
  | { kind: 'note'; markdown: string };

/** camelCase -> snake_case, so recording columns read like paired-table ones (`left_power`). */
export function snakeCase(name: string): string {
  return name.replace(/[A-Z]/g, (c) => `_${c.toLowerCase()}`);
}

/**
 * What a formula sees for a cell's value: tables and recordings as records of columns
 * (`time` plus each column, snake_case), formula cells as a record of their names.
 * Charts and notes have nothing to read.
 */
export function formulaView(value: CellValue): FormulaValue | undefined {
  switch (value.kind) {
    case 'recording': {
      const out: Record<string, FormulaValue> = { time: value.recording.time };
      for (const [k, v] of Object.entries(value.recording.columns)) if (v) out[snakeCase(k)] = v;
      return out;
    }
    case 'table': {
      const out: Record<string, FormulaValue> = { time: value.table.timeS };
      for (const [k, v] of Object.entries(value.table.columns)) out[snakeCase(k)] = v;
      return out;
    }
    case 'values':
      return value.values;
    default:
      return undefined;
  }
}

/** A recording seen as a table on its own time axis (columns keep their names). */
export function recordingAsTable(recording: Recording): Table {
  const columns: Record<string, Float64Array> = {};
  for (const [k, v] of Object.entries(recording.columns)) if (v) columns[k] = v;
  return { timeS: recording.time, columns, meta: { intervalS: recording.meta.sampleIntervalS } };
}
