import { reduceForDisplay } from '../charts/reduce-series.js';
import type { Table } from '../engine/table.js';
import { recordingAsTable, snakeCase, type CellValue } from './cell-value.js';

/** Some rows of a cell's table, as the output view scrolls through it. */
export interface TableWindow {
  /** Rows in the whole table. */
  rows: number;
  /** Column names as formulas read them (`time` first). */
  columns: string[];
  /** Index of the first row given. */
  from: number;
  /** One array per column, rows [from, from + length). */
  values: Record<string, Float64Array>;
}

/** A column thinned for a preview chart (peaks kept). */
export interface TableSeries {
  column: string;
  x: Float64Array;
  y: Float64Array;
}

/** The table behind a cell value, columns named as formulas see them; undefined for non-tables. */
function tableOf(value: CellValue): Table | undefined {
  if (value.kind === 'table') return value.table;
  if (value.kind !== 'recording') return undefined;
  const t = recordingAsTable(value.recording);
  const columns: Record<string, Float64Array> = {};
  for (const [k, v] of Object.entries(t.columns)) columns[snakeCase(k)] = v;
  return { ...t, columns };
}

/**
 * Rows [from, from + count) of a cell's table or recording, copied (so they can be sent
 * across the worker boundary without giving up the cached table).
 *
 * @example tableWindow(value, 0, 50)?.values.time // first 50 times
 */
export function tableWindow(value: CellValue, from: number, count: number): TableWindow | undefined {
  const table = tableOf(value);
  if (table === undefined) return undefined;
  const rows = table.timeS.length;
  const start = Math.max(0, Math.min(rows, Math.floor(from)));
  const end = Math.min(rows, start + Math.max(0, Math.floor(count)));
  const values: Record<string, Float64Array> = { time: table.timeS.slice(start, end) };
  for (const [k, v] of Object.entries(table.columns)) values[k] = v.slice(start, end);
  return { rows, columns: Object.keys(values), from: start, values };
}

/**
 * One column of a cell's table against time, reduced to at most `maxPoints` points by
 * the shared display reducer. Undefined when the cell has no table or no such column.
 */
export function tableSeries(value: CellValue, column: string, maxPoints: number): TableSeries | undefined {
  const table = tableOf(value);
  const y = table?.columns[column];
  if (table === undefined || y === undefined) return undefined;
  const r = reduceForDisplay(table.timeS, y, maxPoints);
  return { column, x: r.x, y: r.y };
}
