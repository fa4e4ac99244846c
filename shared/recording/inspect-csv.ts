import Papa from 'papaparse';
import { EngineError, isEngineError, type EngineWarning } from '../errors.js';
import { guessHeader } from './csv-guess.js';
import type { CsvField, CsvMapping } from './csv-mapping.js';
import { detectTimeFormat } from './csv-time.js';

/** One column as the mapping form shows it. */
export interface CsvColumnInfo {
  name: string;
  /** 0-based position. */
  index: number;
  /** True when the sampled cells are numbers. */
  numeric: boolean;
}

/** What {@link inspectCsv} found: columns, the first rows, and a mapping guessed from the header. */
export interface CsvInspection {
  delimiter: ',' | ';' | '\t' | '|';
  hasHeader: boolean;
  columns: CsvColumnInfo[];
  /** The first data rows as text (header excluded). */
  previewRows: string[][];
  /** The guessed mapping; undefined when no time column could be found. */
  guessedMapping: CsvMapping | undefined;
  /** Why the guess is incomplete (unknown headers, unclear units). */
  warnings: EngineWarning[];
}

const PREVIEW_ROWS = 10;
const SAMPLE_ROWS = 50;

/**
 * Looks at the start of a CSV text for a column-mapping form: delimiter, header row, columns and a
 * guessed mapping (field and unit from header words such as "Power (W)", "speed_kmh", "balance % left").
 *
 * @example inspectCsv('time,power\n0,200\n1,210').guessedMapping?.columns // [{ column: 'power', field: 'power', unit: 'W' }]
 */
export function inspectCsv(text: string, fileName = 'CSV'): CsvInspection {
  // Only the head: papaparse's delimiter detection otherwise touches the whole text.
  const parsed = Papa.parse<string[]>(headOf(text, 64 * 1024), { preview: SAMPLE_ROWS + 1, skipEmptyLines: 'greedy', delimiter: '' });
  const rows = parsed.data;
  const delimiter = normaliseDelimiter(parsed.meta.delimiter);
  try {
    return describeRows(rows, delimiter, fileName, undefined);
  } catch (error) {
    // Clashing or unclear power units are settled in the mapping form, so it still gets the
    // columns: no guess, and the reason as a warning.
    if (!isEngineError(error) || error.code !== 'mixed_units') throw error;
    const { code, message, where } = error.toData();
    return { ...describeRows(rows, delimiter, fileName, undefined, false), warnings: [{ code, message, ...(where ? { where } : {}) }] };
  }
}

/** Shared by inspectCsv and parseCsv: header detection, column names and (unless `guess` is false) the guessed mapping. */
export function describeRows(rows: string[][], delimiter: CsvInspection['delimiter'], fileName: string, hasHeaderOverride: boolean | undefined, guess = true): CsvInspection {
  const first = rows[0] ?? [];
  const hasHeader = hasHeaderOverride ?? first.some((c) => c.trim() !== '' && !Number.isFinite(Number(c.trim().replace(',', '.'))) && detectTimeFormat(c) === undefined);
  const width = rows.reduce((w, r) => Math.max(w, r.length), 0);
  const names = Array.from({ length: width }, (_, i) => {
    const h = hasHeader ? (first[i] ?? '').trim() : '';
    return h === '' ? `Column ${i + 1}` : h;
  });
  const data = rows.slice(hasHeader ? 1 : 0, (hasHeader ? 1 : 0) + SAMPLE_ROWS);
  const columns = names.map((name, index) => ({
    name,
    index,
    numeric: data.some((r) => isNumberCell(r[index])) && data.every((r) => isNumberCell(r[index]) || (r[index] ?? '').trim() === ''),
  }));
  const warnings: EngineWarning[] = [];
  const guessedMapping = guess ? guessMapping(names, data, hasHeader, delimiter, fileName, warnings) : undefined;
  return { delimiter, hasHeader, columns, previewRows: data.slice(0, PREVIEW_ROWS), guessedMapping, warnings };
}

function isNumberCell(cell: string | undefined): boolean {
  const c = (cell ?? '').trim();
  return c !== '' && Number.isFinite(Number(c.replace(',', '.')));
}

function normaliseDelimiter(d: string): CsvInspection['delimiter'] {
  return d === ';' || d === '\t' || d === '|' ? d : ',';
}

function guessMapping(names: string[], data: string[][], hasHeader: boolean, delimiter: CsvInspection['delimiter'], fileName: string, warnings: EngineWarning[]): CsvMapping | undefined {
  let time: CsvMapping['time'] | undefined;
  const columns: CsvMapping['columns'] = [];
  const taken = new Map<CsvField, string>();
  names.forEach((name, i) => {
    const guess = hasHeader ? guessHeader(name) : undefined;
    const cell = data.find((r) => (r[i] ?? '').trim() !== '')?.[i] ?? '';
    if (guess?.field === 'time' || (!hasHeader && i === 0)) {
      // With ';' as delimiter, a comma is the decimal mark.
      const format = detectTimeFormat(delimiter === ';' ? cell.replace(',', '.') : cell);
      if (!time && format) time = { column: name, format };
      return;
    }
    if (!guess) {
      if (hasHeader) warnings.push({ code: 'csv_unknown_column', message: `${fileName}: column "${name}" (column ${i + 1}) is not recognised and was left out; map it by hand if it matters.`, where: { file: fileName, row: 1, column: i + 1, field: name } });
      return;
    }
    if (!guess.unit) {
      if (guess.field === 'power' || guess.field === 'leftPower' || guess.field === 'rightPower') {
        throw new EngineError('mixed_units', `${fileName}: the unit of power column "${name}" (row 1, column ${i + 1}) cannot be decided: ${guess.unitProblem}. Map it by hand.`, { file: fileName, row: 1, column: i + 1, field: name });
      }
      warnings.push({ code: 'unit_undecided', message: `${fileName}: column "${name}" (row 1, column ${i + 1}) looks like ${guess.field} but ${guess.unitProblem}; it was left out. Map it by hand with its unit.`, where: { file: fileName, row: 1, column: i + 1, field: name } });
      return;
    }
    const previous = taken.get(guess.field);
    if (previous !== undefined) {
      const prevUnit = columns.find((c) => c.column === previous)?.unit;
      if (prevUnit !== guess.unit) {
        throw new EngineError('mixed_units', `${fileName}: columns "${previous}" (${prevUnit}) and "${name}" (${guess.unit}, row 1, column ${i + 1}) both hold ${guess.field} in different units; keep one or map them by hand.`, { file: fileName, row: 1, column: i + 1, field: name });
      }
      warnings.push({ code: 'csv_duplicate_column', message: `${fileName}: columns "${previous}" and "${name}" (column ${i + 1}) both hold ${guess.field}; used "${previous}".`, where: { file: fileName, row: 1, column: i + 1, field: name } });
      return;
    }
    taken.set(guess.field, name);
    columns.push({ column: name, field: guess.field, unit: guess.unit });
  });
  // A header-less file: numeric columns after the time are unnamed; guess nothing about them.
  return time ? { delimiter, hasHeader, time, columns } : undefined;
}

/** The text up to the last line break within `max` characters (all of it when shorter). */
export function headOf(text: string, max: number): string {
  if (text.length <= max) return text;
  const cut = text.lastIndexOf('\n', max);
  return cut > 0 ? text.slice(0, cut + 1) : text.slice(0, max);
}
