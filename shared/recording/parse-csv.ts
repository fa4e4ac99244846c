import Papa from 'papaparse';
import { EngineError, type EngineWarning } from '../errors.js';
import { checkUsable } from './check-usable.js';
import { csvMappingSchema, FIELD_UNITS, unitFactor, type CsvMapping } from './csv-mapping.js';
import { StringRowCells, type CsvRowCells } from './csv-row-cells.js';
import { isoLacksZone, parseTimeCell } from './csv-time.js';
import { parseDecimal } from './parse-decimal.js';
import { importFailure } from './import-failure.js';
import type { ImportOptions, ImportResult } from './import-result.js';
import { describeRows, headOf } from './inspect-csv.js';
import type { BalanceSide, Recording, RecordingColumns } from './recording.js';
import { sampleInterval } from './sample-interval.js';
import { CSV_CHUNK_CHARS, scanPlainCsv } from './scan-plain-csv.js';
import { splitPower } from './split-power.js';

const PREVIEW_ROWS = 200;
const PREVIEW_CHARS = 64 * 1024;

/**
 * Reads CSV text into a {@link Recording}. Without `mapping`, the delimiter, header
 * row, time column (seconds, h:mm:ss or ISO 8601) and column units are guessed from the text
 * (see `inspectCsv`). Speeds become m/s, kW becomes W, balance keeps the side its header states.
 * Never throws: problems come back as `{ ok: false, error }` naming the file, row and column.
 *
 * papaparse reads the head (delimiter, header, mapping) and any text with quotes; quote-free
 * text, the usual export, is read in place by {@link scanPlainCsv}, which hands over the same
 * rows and cells without a string per cell (several times faster at 10 Hz), so both give the
 * same recording and warnings.
 *
 * @example parseCsv('time,power\n0,200\n...', 'ride.csv')
 */
export function parseCsv(text: string, fileName: string, mapping?: CsvMapping, options: ImportOptions = {}): ImportResult {
  try {
    const recording = readCsv(text, fileName, mapping ?? options.csvMapping, options);
    return { ok: true, recording, warnings: recording.warnings };
  } catch (error) {
    return importFailure(error, fileName);
  }
}

function readCsv(text: string, fileName: string, given: CsvMapping | undefined, options: ImportOptions): Recording {
  const file = fileName;
  if (!/\S/.test(text)) throw new EngineError('empty_file', `${file} is empty: there is no text to read.`, { file });
  const checked = given === undefined ? undefined : csvMappingSchema.safeParse(given);
  if (checked && !checked.success) {
    const issue = checked.error.issues[0];
    throw new EngineError('csv_mapping_invalid', `${file}: the column mapping is not valid (${issue?.path.join('.') || 'mapping'}: ${issue?.message}).`, { file, field: issue?.path.join('.') });
  }
  // A preview decides delimiter, header and mapping; the full pass then reads chunks whose rows die
  // young instead of living as one big array (that alone doubled the cost through GC).
  // Only the head goes to the preview: papaparse's detection otherwise touches the whole text.
  const head = headOf(text, PREVIEW_CHARS);
  const preview = Papa.parse<string[]>(head, { delimiter: checked?.data.delimiter ?? '', skipEmptyLines: false, preview: PREVIEW_ROWS });
  const rows = preview.data;
  const moreRows = preview.meta.truncated || head.length < text.length;
  const delimiter = preview.meta.delimiter;
  const inspection = describeRows(firstRows(rows, 60), delimiter === ';' || delimiter === '\t' || delimiter === '|' ? delimiter : ',', file, checked?.data.hasHeader);
  const firstData = firstDataRow(rows, inspection.hasHeader);
  if (firstData >= rows.length && !moreRows) {
    const headerRow = rows.findIndex((r) => !isBlank(r)) + 1;
    throw new EngineError('header_only', `${file} has a header row (row ${headerRow}) but no data rows after it (row ${headerRow + 1} is missing).`, { file, row: headerRow + 1 });
  }
  if (!inspection.columns.some((c) => c.numeric)) {
    throw new EngineError('no_numeric_columns', `${file}: none of its ${inspection.columns.length} columns holds numbers (checked rows ${firstData + 1}-${Math.min(rows.length, firstData + 50)}), so it is not a recording.`, { file, row: firstData + 1 });
  }
  if (!given && !inspection.hasHeader) {
    throw new EngineError('csv_needs_mapping', `${file} has no header row, so its columns cannot be recognised; map them by hand.`, { file, row: 1 });
  }
  const mapping = checked?.data ?? inspection.guessedMapping;
  if (!mapping) {
    const names = inspection.columns.map((c) => `"${c.name}"`).join(', ');
    throw new EngineError('no_time_column', `${file}: no column holds the time (looked for a header such as "time", "seconds" or "timestamp" among ${names}). Map the time column by hand.`, { file, row: 1 });
  }
  const warnings: EngineWarning[] = [...inspection.warnings];
  const names = inspection.columns.map((c) => c.name);
  const indexOf = (column: string, field: string): number => {
    const i = names.indexOf(column);
    if (i < 0) throw new EngineError('csv_mapping_column', `${file}: the mapping names column "${column}" for ${field}, but the file has no such column (it has ${names.map((n) => `"${n}"`).join(', ')}).`, { file, row: 1, field: column });
    return i;
  };
  const timeAt = indexOf(mapping.time.column, 'time');
  for (const c of mapping.columns) {
    if (!FIELD_UNITS[c.field].includes(c.unit)) throw new EngineError('mixed_units', `${file}: column "${c.column}" is mapped to ${c.field} in ${c.unit}, which is not a unit of ${c.field} (${FIELD_UNITS[c.field].join(', ')}).`, { file, field: c.column });
  }
  let capacity = countLines(text);
  const mapped = mapping.columns;
  // Plain parallel arrays for the hot loop below.
  const width = mapped.length;
  const ats = Int32Array.from(mapped, (c) => indexOf(c.column, c.field));
  const factors = Float64Array.from(mapped, (c) => unitFactor(c.unit));
  const outs = mapped.map(() => new Float64Array(capacity).fill(NaN));
  let time = new Float64Array(capacity);
  const decimalComma = delimiter === ';';
  const issues = { badTime: [] as number[], repeated: [] as number[], backwards: [] as number[], badCells: 0, firstBad: undefined as undefined | { row: number; column: string } };
  let first = NaN;
  let last = -Infinity;
  let m = 0;
  let r = -1;
  const format = mapping.time.format;
  const readTime = format === 'seconds' ? parseDecimal : (cell: string): number => parseTimeCell(cell, format);
  const plainSeconds = format === 'seconds' && !decimalComma;
  const consume = (row: CsvRowCells): void => {
    r++;
    if (r < firstData || (row.count === 1 && row.text(0).trim() === '')) return;
    const raw = plainSeconds ? row.decimal(timeAt) : readTime(decimalComma ? row.text(timeAt).replace(',', '.') : row.text(timeAt));
    if (Number.isNaN(raw)) {
      issues.badTime.push(r + 1);
      return;
    }
    let k = m;
    if (raw === last) ((k = m - 1), issues.repeated.push(r + 1));
    else if (raw < last) {
      issues.backwards.push(r + 1);
      return;
    } else {
      if (m === capacity) {
        capacity *= 2;
        time = grow(time, capacity, 0);
        for (let j = 0; j < outs.length; j++) outs[j] = grow(outs[j]!, capacity, NaN);
      }
      if (Number.isNaN(first)) first = raw;
      time[m++] = mapping.time.format === 'iso' ? (raw - first) / 1000 : raw - first;
      last = raw;
    }
    for (let j = 0; j < width; j++) {
      const out = outs[j]!;
      if (out[k] === out[k]) continue; // already set (a merged repeat fills gaps only)
      const at = ats[j]!;
      if (row.empty(at)) continue;
      let v = row.decimal(at);
      if (v !== v && decimalComma) v = parseDecimal(row.text(at).replace(',', '.'));
      if (v !== v) {
        if (row.text(at).trim() !== '' && issues.badCells++ === 0) issues.firstBad = { row: r + 1, column: mapped[j]!.column };
        continue;
      }
      const factor = factors[j]!;
      out[k] = factor === 1 ? v : v * factor;
    }
  };
  let keep = timeAt + 1;
  for (let j = 0; j < width; j++) keep = Math.max(keep, ats[j]! + 1);
  if (!scanPlainCsv(text, delimiter, keep, consume)) {
    // Chunks, not `step`: papaparse's per-row callback costs twice the parse itself. Its types list
    // `chunk` for files only, but a string input is chunked the same way, synchronously.
    const cells = new StringRowCells();
    const streaming: Papa.ParseConfig<string[]> & { chunkSize: number; chunk: (result: Papa.ParseResult<string[]>) => void } = {
      delimiter,
      skipEmptyLines: false,
      chunkSize: CSV_CHUNK_CHARS,
      chunk: (result) => {
        const chunkRows = result.data;
        for (let i = 0; i < chunkRows.length; i++) {
          cells.row = chunkRows[i]!;
          consume(cells);
        }
      },
    };
    Papa.parse<string[]>(text, streaming);
  }
  reportRowIssues(issues, file, warnings);
  if (mapping.time.format === 'iso' && isoLacksZone(rows[firstData]?.[timeAt] ?? '')) {
    warnings.push({ code: 'csv_time_zone_assumed', message: `${file}: the times in column "${mapping.time.column}" carry no time zone; read as UTC.`, where: { file, field: mapping.time.column } });
  }
  const columns: RecordingColumns = {};
  let side: BalanceSide = 'none';
  for (const [j, c] of mapped.entries()) {
    columns[c.field] = trim(outs[j]!, m);
    if (c.field === 'balance') side = c.unit === '% left' ? 'left' : c.unit === '% right' ? 'right' : 'unknown';
  }
  completeLegs(columns, side, m);
  const axis = trim(time, m);
  let dropouts = 0;
  if (columns.power) for (let i = 0; i < m; i++) if (Number.isNaN(columns.power[i]!)) dropouts++;
  const startMs = mapping.time.format === 'iso' ? first : (mapping.startMs ?? NaN);
  const recording: Recording = {
    meta: {
      fileName: file, format: 'csv', device: options.label ? { label: options.label } : {}, startMs,
      sampleIntervalS: sampleInterval(axis), totalS: m > 0 ? axis[m - 1]! : 0, pausedS: 0, balanceSide: side, dropouts,
    },
    time: axis, columns, events: [], warnings,
  };
  checkUsable(recording, options);
  return recording;
}

/** Fills total or leg power from the others: total = left + right; legs from total and a sided balance. */
function completeLegs(columns: RecordingColumns, side: BalanceSide, m: number): void {
  const { power, leftPower, rightPower, balance } = columns;
  if (!power && leftPower && rightPower) {
    const total = new Float64Array(m);
    for (let i = 0; i < m; i++) total[i] = leftPower[i]! + rightPower[i]!;
    columns.power = total;
  } else if (power && balance && !leftPower && !rightPower) {
    const left = new Float64Array(m);
    const right = new Float64Array(m);
    if (splitPower(power, balance, side, left, right)) Object.assign(columns, { leftPower: left, rightPower: right });
  }
}

/** Upper bound of the row count, so the columns are allocated once. */
function countLines(text: string): number {
  let lines = 1;
  for (let i = text.indexOf('\n'); i >= 0; i = text.indexOf('\n', i + 1)) lines++;
  return lines;
}

/** The first `m` values: a view when little would be wasted, else a compact copy. */
function trim(values: Float64Array, m: number): Float64Array {
  return m >= values.length * 0.9 ? values.subarray(0, m) : values.slice(0, m);
}

function grow(values: Float64Array, capacity: number, fill: number): Float64Array<ArrayBuffer> {
  const out = new Float64Array(capacity).fill(fill);
  out.set(values);
  return out;
}

function firstRows(rows: string[][], count: number): string[][] {
  const out: string[][] = [];
  for (let r = 0; r < rows.length && out.length < count; r++) if (!isBlank(rows[r]!)) out.push(rows[r]!);
  return out;
}

function isBlank(row: string[]): boolean {
  return row.length === 0 || (row.length === 1 && row[0]!.trim() === '');
}

function firstDataRow(rows: string[][], hasHeader: boolean): number {
  let r = 0;
  while (r < rows.length && isBlank(rows[r]!)) r++;
  if (hasHeader) r++;
  while (r < rows.length && isBlank(rows[r]!)) r++;
  return r;
}

function reportRowIssues(issues: { badTime: number[]; repeated: number[]; backwards: number[]; badCells: number; firstBad: { row: number; column: string } | undefined }, file: string, warnings: EngineWarning[]): void {
  const say = (code: string, list: number[], what: string): void => {
    if (list.length > 0) warnings.push({ code, message: `${file}: ${list.length} row${list.length > 1 ? 's' : ''} ${what}, first at row ${list[0]}.`, where: { file, row: list[0]!, field: 'time' } });
  };
  say('csv_bad_time', issues.badTime, 'have no readable time and were left out');
  say('csv_repeated_time', issues.repeated, 'repeat the previous time and were merged into it (missing cells filled, existing values kept)');
  say('csv_backward_time', issues.backwards, 'have a time earlier than the row before and were dropped');
  if (issues.firstBad) {
    warnings.push({
      code: 'csv_bad_cell',
      message: `${file}: ${issues.badCells} cell${issues.badCells > 1 ? 's are' : ' is'} not a number and read as missing, first at row ${issues.firstBad.row}, column "${issues.firstBad.column}".`,
      where: { file, row: issues.firstBad.row, field: issues.firstBad.column },
    });
  }
}
