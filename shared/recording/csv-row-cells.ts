import { parseDecimal } from './parse-decimal.js';

/**
 * One CSV row as the CSV reader consumes it, whether papaparse split it into strings or
 * {@link scanPlainCsv} found its cells in place. A cell past the end of the row reads as ''.
 */
export interface CsvRowCells {
  /** Cells in the row. */
  readonly count: number;
  /** The cell's text ('' past the end of the row). */
  text(i: number): string;
  /** True when the cell is '' or past the end of the row. */
  empty(i: number): boolean;
  /** `parseDecimal(text(i))`, built without the string where the source allows it. */
  decimal(i: number): number;
}

/**
 * {@link CsvRowCells} over a row of strings, as papaparse returns them. One instance serves
 * every row: set `row` before handing it on.
 *
 * @example const cells = new StringRowCells(); cells.row = ['0', '200']; cells.decimal(1) // 200
 */
export class StringRowCells implements CsvRowCells {
  row: string[] = [];

  get count(): number {
    return this.row.length;
  }

  text(i: number): string {
    return this.row[i] ?? '';
  }

  empty(i: number): boolean {
    const cell = this.row[i];
    return cell === undefined || cell === '';
  }

  decimal(i: number): number {
    return parseDecimal(this.row[i] ?? '');
  }
}
