/**
 * Columns on one regular time grid: what resampling and pairing produce and what the
 * statistics read. `timeS` is seconds from the reference's first sample; every column
 * has the same length as `timeS`; NaN marks a missing sample (a dropout, or outside a
 * recording), never zero power.
 */
export interface Table {
  timeS: Float64Array;
  columns: Record<string, Float64Array>;
  meta?: TableMeta;
}

/** How a table was made, kept beside it so reports can state it. */
export interface TableMeta {
  /** Grid spacing, seconds. */
  intervalS?: number;
  /** Longest gap between source samples that was bridged, seconds. */
  maxGapS?: number;
  /** Seconds added to the grid time to read the source recording. */
  shiftS?: number;
  /** Where gear columns came from when the table pairs two recordings. */
  gearSource?: 'reference' | 'test' | 'none';
  [key: string]: unknown;
}

/**
 * Number of rows of a table.
 *
 * @example tableLength({ timeS: new Float64Array(3), columns: {} }) // 3
 */
export function tableLength(table: Table): number {
  return table.timeS.length;
}
