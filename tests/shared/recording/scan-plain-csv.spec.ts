import fc from 'fast-check';
import Papa from 'papaparse';
import { describe, expect, it, vi } from 'vitest';
import type { ImportResult } from '../../../shared/recording/import-result.js';
import { parseCsv } from '../../../shared/recording/parse-csv.js';
import { parseDecimal, parseDecimalIn } from '../../../shared/recording/parse-decimal.js';
import type { Recording } from '../../../shared/recording/recording.js';
import { CSV_CHUNK_CHARS, scanPlainCsv } from '../../../shared/recording/scan-plain-csv.js';
import { writeCsv } from '../../../shared/recording/write-csv.js';
import { deviceView } from '../../../shared/synthetic/device-view.js';
import { synthesizeRide } from '../../../shared/synthetic/synthesize-ride.js';
import { generateFixtures } from '../../fixtures/generate.js';

// parseCsv reads through the in-place scanner when it can; `scanner.off` makes it fall back to
// papaparse, so one text can be read both ways and the two recordings compared.
const scanner = vi.hoisted(() => ({ off: false, used: 0 }));
vi.mock('../../../shared/recording/scan-plain-csv.js', async (importOriginal) => {
  const actual = await importOriginal<typeof import('../../../shared/recording/scan-plain-csv.js')>();
  return {
    ...actual,
    scanPlainCsv: (...args: Parameters<typeof actual.scanPlainCsv>): boolean => {
      if (scanner.off) return false;
      const read = actual.scanPlainCsv(...args);
      if (read) scanner.used++;
      return read;
    },
  };
});

/** The rows papaparse gives for the whole text, read as parseCsv's fallback reads it. */
function papaRows(text: string, delimiter: string): string[][] {
  const rows: string[][] = [];
  const config: Papa.ParseConfig<string[]> & { chunkSize: number; chunk: (r: Papa.ParseResult<string[]>) => void } = {
    delimiter,
    skipEmptyLines: false,
    chunkSize: CSV_CHUNK_CHARS,
    chunk: (r) => rows.push(...r.data),
  };
  Papa.parse<string[]>(text, config);
  return rows;
}

/** The rows the scanner gives, each as its cell texts and numbers; undefined when it declines. */
function scannedRows(text: string, delimiter: string, keep = 40): { cells: string[]; numbers: number[] }[] | undefined {
  const rows: { cells: string[]; numbers: number[] }[] = [];
  let inconsistent = 0;
  const read = scanPlainCsv(text, delimiter, keep, (row) => {
    const cells: string[] = [];
    const numbers: number[] = [];
    for (let i = 0; i < row.count; i++) {
      cells.push(row.text(i));
      numbers.push(row.decimal(i));
      if (row.empty(i) !== (row.text(i) === '')) inconsistent++;
    }
    if (!row.empty(row.count) || !Number.isNaN(row.decimal(row.count)) || row.text(row.count) !== '') inconsistent++;
    rows.push({ cells, numbers });
  });
  expect(inconsistent, 'empty() and cells past the end agree with text()').toBe(0);
  return read ? rows : undefined;
}

function expectSameRows(text: string, delimiter: string): void {
  const scanned = scannedRows(text, delimiter);
  expect(scanned, 'the scanner should read this text').toBeDefined();
  const papa = papaRows(text, delimiter);
  expect(scanned!.map((r) => r.cells)).toEqual(papa);
  const differ: string[] = [];
  scanned!.forEach((r, k) => r.numbers.forEach((v, i) => Object.is(v, parseDecimal(papa[k]![i]!)) || differ.push(`row ${k} cell ${i}`)));
  expect(differ).toEqual([]);
}

/** Both recordings, bit for bit: columns compared with Object.is, so -0, NaN and rounding count. */
function expectSameResult(a: ImportResult, b: ImportResult): void {
  expect(a.ok).toBe(b.ok);
  if (!a.ok || !b.ok) {
    expect(a).toEqual(b);
    return;
  }
  expect(a.warnings).toEqual(b.warnings);
  const ra: Recording = a.recording;
  const rb: Recording = b.recording;
  expect(ra.meta).toEqual(rb.meta);
  expect(ra.events).toEqual(rb.events);
  expect(Object.keys(ra.columns).sort()).toEqual(Object.keys(rb.columns).sort());
  const same = (x: Float64Array, y: Float64Array, what: string): void => {
    expect(x.length, what).toBe(y.length);
    for (let i = 0; i < x.length; i++) if (!Object.is(x[i], y[i])) expect.fail(`${what}[${i}]: ${x[i]} vs ${y[i]}`);
  };
  same(ra.time, rb.time, 'time');
  for (const [name, values] of Object.entries(ra.columns)) same(values!, rb.columns[name as keyof Recording['columns']]!, name);
}

/** parseCsv through the scanner and through papaparse; returns whether the scanner read it. */
function bothWays(text: string, name = 'ride.csv'): boolean {
  const before = scanner.used;
  const fast = parseCsv(text, name);
  scanner.off = true;
  try {
    expectSameResult(fast, parseCsv(text, name));
  } finally {
    scanner.off = false;
  }
  return scanner.used > before;
}

describe('parseDecimalIn', () => {
  it('is parseDecimal of the slice, for decimals, signs, exponents, spaces and junk', () => {
    const cell = fc.oneof(
      fc.string({ maxLength: 20 }),
      fc.double({ noNaN: false }).map(String),
      fc.tuple(fc.integer({ min: -99999, max: 99999 }), fc.nat({ max: 99999 })).map(([a, b]) => `${a}.${b}`),
      fc.stringMatching(/^[+-]?\d{0,17}(\.\d{0,17})?$/),
      fc.constantFrom('', ' ', '.', '-', '+', '1e3', ' 12 ', '0x1f', '1,5', 'NaN', 'Infinity', '-0', '00012.500', '12.', '.5'),
    );
    fc.assert(
      fc.property(cell, fc.string({ maxLength: 3 }), fc.string({ maxLength: 3 }), (c, before, after) => {
        const text = before + c + after;
        const v = parseDecimalIn(text, before.length, before.length + c.length);
        expect(Object.is(v, parseDecimal(c))).toBe(true);
      }),
      { numRuns: 3000, seed: 5 },
    );
  });
});

describe('scanPlainCsv gives the rows papaparse gives', () => {
  it.each([
    ['LF, trailing line break', 'time,power\n0,200\n1,210\n', ','],
    ['no trailing line break', 'time,power\n0,200\n1,210', ','],
    ['CR LF', 'time,power\r\n0,200\r\n1,210\r\n', ','],
    ['CR LF with a lone LF inside a cell', 'time,power\r\n0,20\n0\r\n1,210\r\n', ','],
    ['LF with stray CRs', 'time,power\n0,200\r\n1,2\r10\n', ','],
    ['BOM', '\ufefftime;power\n0;200,5\n', ';'],
    ['blank, whitespace and delimiter-only lines', 'time\tpower\n\n0\t200\n   \n\t\n1\t\n', '\t'],
    ['short, long and odd rows', 'time|power|cadence\n0|200\n1|210|90|extra|more\n2|abc| 85 \n3|1e2|+4\n', '|'],
    ['one column', 'time\n0\n1\n2\n', ','],
    ['empty text after a BOM', '\ufeff', ','],
  ])('%s', (_name, text, delimiter) => expectSameRows(text, delimiter));

  it('reads lines across papaparse chunk boundaries the same way', () => {
    const n = 90_000;
    const text = `time (s),power (W)\r\n${Array.from({ length: n }, (_, i) => `${i / 10},${200 + (i % 97)}`).join('\r\n')}\r\n`;
    expect(text.length).toBeGreaterThan(CSV_CHUNK_CHARS);
    expectSameRows(text, ',');
  }, 30_000);

  it('declines text with quotes, a lone-CR line break or a delimiter it cannot split on', () => {
    expect(scannedRows('time,power\n0,"200"\n', ',')).toBeUndefined();
    expect(scannedRows('time,power\r0,200\r1,210\r', ',')).toBeUndefined();
    expect(scannedRows('time::power\n0::200\n', '::')).toBeUndefined();
    expect(scannedRows('time\npower\n', '\n')).toBeUndefined();
  });

  it('fuzzed text: same rows whenever it reads, for any mix of delimiters, line breaks, blanks and junk', () => {
    const piece = fc.constantFrom(',', ';', '\t', '\n', '\r\n', '\r', ' ', '', '12', '-3.5', '1e3', 'x', '\ufeff', '.', '+');
    fc.assert(
      fc.property(fc.array(piece, { maxLength: 60 }), fc.constantFrom(',', ';', '\t', '|'), (pieces, delimiter) => {
        const text = pieces.join('');
        const scanned = scannedRows(text, delimiter);
        if (scanned !== undefined) expect(scanned.map((r) => r.cells)).toEqual(papaRows(text, delimiter));
      }),
      { numRuns: 3000, seed: 17 },
    );
  });
});

describe('parseCsv reads the same recording through the scanner and through papaparse', () => {
  it('the CSV fixtures (seconds and km/h, clock and mph with tabs, ISO with semicolons and decimal commas)', () => {
    for (const f of generateFixtures().filter((x) => x.name.endsWith('.csv'))) {
      expect(bothWays(new TextDecoder().decode(f.bytes), f.name), f.name).toBe(true);
    }
  });

  it('a 10 Hz ride with dropouts, pedal metrics and gears, over several parsing chunks', () => {
    const ride = synthesizeRide({ seed: 3, rateHz: 10, blocks: [{ kind: 'steady', durationS: 1800, powerW: 240, cadenceRpm: 90, front: 2, rear: 6 }] });
    const view = deviceView(ride, { label: 'Ten hertz', intervalS: 0.1, channels: { pedalMetrics: true, gears: true }, dropouts: { perHour: 60, meanLengthS: 3 } });
    const text = writeCsv(view.recording, { speedUnit: 'km/h' });
    expect(text.length).toBeGreaterThan(CSV_CHUNK_CHARS);
    expect(bothWays(text, 'ten.csv')).toBe(true);
    expect(bothWays(text.replace(/\n/g, '\r\n'), 'ten-crlf.csv')).toBe(true);
  }, 30_000);

  it('rows the reader warns about: bad time, repeated and backward time, text cells, blank lines, short rows', () => {
    const text = [
      'time (s),power (W),cadence (rpm)',
      '0,200,90',
      '1,201',
      '',
      '1,,91',
      'x,205,90',
      '0.5,206,90',
      '2,abc,90',
      '3, 207 ,1e2',
      '   ',
      '4,208,90,9',
      ...Array.from({ length: 30 }, (_, i) => `${5 + i},${210 + i},90`),
    ].join('\n');
    const result = parseCsv(text, 'warn.csv');
    // The row with a fourth cell also gives the file an unnamed fourth column.
    expect(result.ok && result.warnings.map((w) => w.code)).toEqual(['csv_unknown_column', 'csv_bad_time', 'csv_repeated_time', 'csv_backward_time', 'csv_bad_cell']);
    expect(bothWays(text, 'warn.csv')).toBe(true);
  });

  it('files the reader refuses fail the same way both ways', () => {
    for (const text of ['time,power\n', 'a,b\nx,y\nz,w\n', 'power,cadence\n200,90\n', 'time,power (furlongs)\n0,1\n']) bothWays(text, 'bad.csv');
  });

  it('mutated CSV bytes: the same result (recording and warnings, or error) both ways', () => {
    const ride = synthesizeRide({ seed: 8, blocks: [{ kind: 'steady', durationS: 40, powerW: 200, cadenceRpm: 90, front: 2, rear: 6 }] });
    const base = writeCsv(deviceView(ride, { label: 'Fuzz crank', channels: { pedalMetrics: true } }).recording, { time: 'clock', speedUnit: 'km/h' });
    const edit = fc.record({ at: fc.nat(), cut: fc.nat({ max: 4 }), insert: fc.constantFrom('', ',', ';', '\n', '\r\n', '\r', ' ', 'x', '9', '.', '-', '\t', '\n\n', ',,') });
    fc.assert(
      fc.property(fc.array(edit, { minLength: 1, maxLength: 6 }), (edits) => {
        let text = base;
        for (const e of edits) {
          const at = e.at % (text.length + 1);
          text = text.slice(0, at) + e.insert + text.slice(at + e.cut);
        }
        bothWays(text, 'fuzz.csv');
      }),
      { numRuns: 400, seed: 23 },
    );
  }, 60_000);
});
