import { EngineError } from '../../errors.js';
import type { Table } from '../../engine/table.js';
import type { Recording } from '../../recording/recording.js';
import { recordingAsTable, type CellValue, type NotebookTable } from '../cell-value.js';

/** The value of a cell a transform reads, by the name it was given. */
export interface TransformInput {
  name: string;
  value: CellValue;
}

/** The input as a recording; tables made by other transforms no longer are. */
export function asRecording(input: TransformInput, op: string): Recording {
  if (input.value.kind !== 'recording') {
    throw new EngineError('transform_input', `${op} reads an imported recording, but "${input.name}" is a ${input.value.kind}`);
  }
  return input.value.recording;
}

/** The input as a table (a recording is seen on its own time axis). */
export function asTable(input: TransformInput, op: string): NotebookTable {
  const v = input.value;
  if (v.kind === 'table') return v;
  if (v.kind === 'recording') return { table: recordingAsTable(v.recording) };
  throw new EngineError('transform_input', `${op} reads a table or recording, but "${input.name}" is a ${v.kind}`);
}

/** A column by name, trying the paired-table and recording spellings (`ref_power`, `power`). */
export function findColumn(table: Table, names: readonly string[]): Float64Array | undefined {
  for (const n of names) if (table.columns[n] !== undefined) return table.columns[n];
  return undefined;
}

/** Rows [from, to) of a table: every column sliced the same way. */
export function sliceTable(table: Table, from: number, to: number): Table {
  const columns: Record<string, Float64Array> = {};
  for (const [k, v] of Object.entries(table.columns)) columns[k] = v.slice(from, to);
  return table.meta ? { timeS: table.timeS.slice(from, to), columns, meta: table.meta } : { timeS: table.timeS.slice(from, to), columns };
}
