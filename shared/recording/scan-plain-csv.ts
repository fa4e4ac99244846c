import type { CsvRowCells } from './csv-row-cells.js';
import { parseDecimalIn } from './parse-decimal.js';

const LF = 10;
const CR = 13;
const QUOTE = '"';
const BOM = 0xfeff;
/**
 * Characters per papaparse chunk when the CSV reader falls back to it. papaparse guesses the
 * line break from its first chunk, so the scanner guesses from as much.
 */
export const CSV_CHUNK_CHARS = 1 << 20;

/**
 * Reads CSV text row by row without building a string per cell: cells are located in place
 * and their numbers parsed from the characters ({@link parseDecimalIn}). Hands every row, in
 * order, to `visit` as {@link CsvRowCells}, exactly as papaparse would split it with the same
 * delimiter (`skipEmptyLines: false`, line break guessed by papaparse's rule, a leading BOM
 * dropped, the text after the last line break as a final row): a blank line is a row of one
 * empty cell, a short row has fewer cells, an odd cell comes back as its text.
 *
 * Only for text papaparse reads in its quote-free mode: returns false, having read nothing,
 * when the text holds a quote character, the delimiter is not one plain character, or the
 * line break is a lone CR. The caller then parses with papaparse.
 *
 * `keep` = how many leading cells of a row may be asked for (the highest column index the
 * caller reads, plus one); cells after them are counted, not located.
 *
 * @example
 * scanPlainCsv('t,p\n0,200\n', ',', 2, (row) => console.log(row.count, row.decimal(1))); // 2 NaN / 2 200 / 1 NaN
 */
export function scanPlainCsv(text: string, delimiter: string, keep: number, visit: (row: CsvRowCells) => void): boolean {
  if (delimiter.length !== 1 || delimiter === '\r' || delimiter === '\n' || delimiter === QUOTE || delimiter.charCodeAt(0) === BOM) return false;
  if (text.indexOf(QUOTE) >= 0) return false;
  const from = text.charCodeAt(0) === BOM ? 1 : 0;
  // papaparse gives no row at all for empty text.
  if (from === text.length) return true;
  const newline = guessNewline(text.slice(from, from + CSV_CHUNK_CHARS));
  if (newline === '\r') return false;
  const crlf = newline === '\r\n';
  const row = new RangeRowCells(text, Math.max(1, keep));
  const { starts, ends } = row;
  const d = delimiter.charCodeAt(0);
  const n = text.length;
  let cell = 0;
  starts[0] = from;
  for (let i = from; i < n; i++) {
    const c = text.charCodeAt(i);
    if (c === d) {
      if (cell < keep) ends[cell] = i;
      cell++;
      if (cell < keep) starts[cell] = i + 1;
    } else if (c === LF) {
      // With CR LF line breaks a lone LF is part of the cell, as papaparse's split leaves it.
      if (crlf && (i === from || text.charCodeAt(i - 1) !== CR)) continue;
      if (cell < keep) ends[cell] = crlf ? i - 1 : i;
      row.count = cell + 1;
      visit(row);
      cell = 0;
      starts[0] = i + 1;
    }
  }
  if (cell < keep) ends[cell] = n;
  row.count = cell + 1;
  visit(row);
  return true;
}

/** papaparse's line-break guess for quote-free text: LF unless CRs come first and most are followed by LF. */
function guessNewline(head: string): '\n' | '\r\n' | '\r' {
  const firstCr = head.indexOf('\r');
  if (firstCr < 0) return '\n';
  const firstLf = head.indexOf('\n');
  if (firstLf >= 0 && firstLf < firstCr) return '\n';
  let crs = 0;
  let crLfs = 0;
  for (let i = firstCr; i >= 0; i = head.indexOf('\r', i + 1)) {
    crs++;
    if (head.charCodeAt(i + 1) === LF) crLfs++;
  }
  return crLfs >= (crs + 1) / 2 ? '\r\n' : '\r';
}

/** The cells of the current row as [start, end) ranges of the text. */
class RangeRowCells implements CsvRowCells {
  count = 0;
  readonly starts: Int32Array;
  readonly ends: Int32Array;

  constructor(
    private readonly source: string,
    keep: number,
  ) {
    this.starts = new Int32Array(keep);
    this.ends = new Int32Array(keep);
  }

  text(i: number): string {
    return i < this.count ? this.source.slice(this.starts[i]!, this.ends[i]!) : '';
  }

  empty(i: number): boolean {
    return i >= this.count || this.starts[i] === this.ends[i];
  }

  decimal(i: number): number {
    return i < this.count ? parseDecimalIn(this.source, this.starts[i]!, this.ends[i]!) : NaN;
  }
}
