import { describe, expect, it } from 'vitest';
import { csvMappingSchema, type CsvMapping } from '../../../shared/recording/csv-mapping.js';
import { inspectCsv } from '../../../shared/recording/inspect-csv.js';
import { parseCsv } from '../../../shared/recording/parse-csv.js';
import type { Recording } from '../../../shared/recording/recording.js';
import { generateFixtures } from '../../fixtures/generate.js';

const fixtures = generateFixtures();
const text = (name: string): string => new TextDecoder().decode(fixtures.find((f) => f.name === name)!.bytes);
const view = fixtures.find((f) => f.name === 'crank.fit')!.view.recording;

function read(csv: string, name = 'ride.csv', mapping?: CsvMapping): Recording {
  const result = parseCsv(csv, name, mapping);
  if (!result.ok) throw new Error(result.error.message);
  return result.recording;
}

const rows = (n: number, row: (i: number) => string): string => Array.from({ length: n }, (_, i) => row(i)).join('\n');

describe('parseCsv reads the CSV writer output back to the same recording', () => {
  for (const name of ['crank-seconds-kmh.csv', 'crank-clock-mph.csv', 'crank-iso-semicolon.csv']) {
    it(name, () => {
      const rec = read(text(name), name);
      expect(Array.from(rec.time)).toEqual(Array.from(view.time));
      expect(rec.meta.balanceSide).toBe('right');
      expect(rec.meta.dropouts).toBe(view.meta.dropouts);
      expect(Array.from(rec.columns.power!)).toEqual(Array.from(view.columns.power!));
      expect(Array.from(rec.columns.frontGearTeeth!)).toEqual(Array.from(view.columns.frontGearTeeth!));
      // Speed goes through km/h or mph with 4 decimals: within 1e-4 of the unit, converted back to m/s.
      view.columns.speed!.forEach((v, i) => expect(Math.abs(rec.columns.speed![i]! - v)).toBeLessThan(1e-4));
      if (name.includes('iso')) expect(rec.meta.startMs).toBe(view.meta.startMs);
      else expect(Number.isNaN(rec.meta.startMs)).toBe(true);
    });
  }
});

describe('parseCsv units, time formats and delimiters', () => {
  it('converts km/h and mph to m/s (1 mph = 0.44704 m/s exactly, international yard and pound agreement 1959)', () => {
    const kmh = read(`time,speed (km/h),power (W)\n${rows(12, (i) => `${i},36,200`)}`);
    expect(kmh.columns.speed![0]).toBeCloseTo(10, 12);
    const mph = read(`time,speed_mph,power_w\n${rows(12, (i) => `${i},10,200`)}`);
    expect(mph.columns.speed![0]).toBeCloseTo(4.4704, 12);
  });

  it('turns a "% left" balance into legs', () => {
    const rec = read(`time (s),power (W),L/R balance (% left)\n${rows(12, (i) => `${i},300,60`)}`);
    expect(rec.meta.balanceSide).toBe('left');
    expect(rec.columns.leftPower![0]).toBeCloseTo(180, 9);
    expect(rec.columns.rightPower![0]).toBeCloseTo(120, 9);
  });

  it('adds legs to a total when the file has left and right power only', () => {
    const rec = read(`seconds,left power,right power\n${rows(12, (i) => `${i},150,140`)}`);
    expect(rec.columns.power![0]).toBe(290);
  });

  it('reads h:mm:ss and mm:ss clocks, ISO 8601 with and without a zone', () => {
    expect(read(`time,power\n${rows(12, (i) => `1:00:${String(i).padStart(2, '0')},200`)}`).time[11]).toBe(11);
    expect(read(`time,power\n${rows(12, (i) => `01:${String(i * 5).padStart(2, '0')},200`)}`).time[11]).toBe(55);
    const zoned = read(`timestamp,power\n${rows(12, (i) => `2026-03-02T10:00:${String(i).padStart(2, '0')}+01:00,200`)}`);
    expect(zoned.meta.startMs).toBe(Date.UTC(2026, 2, 2, 9));
    const result = parseCsv(`timestamp,power\n${rows(12, (i) => `2026-03-02 09:00:${String(i).padStart(2, '0')}.5,200`)}`, 'naive.csv');
    expect(result.ok && result.recording.meta.startMs).toBe(Date.UTC(2026, 2, 2, 9, 0, 0, 500));
    expect(result.ok && result.warnings.map((w) => w.code)).toContain('csv_time_zone_assumed');
  });

  it('detects semicolons with decimal commas, and tabs', () => {
    const semi = read(`time;power;cadence\n${rows(12, (i) => `${i},5;200,5;90`)}`);
    expect(semi.time[1]).toBe(1);
    expect(semi.columns.power![0]).toBe(200.5);
    expect(read(`time\tpower\n${rows(12, (i) => `${i}\t210`)}`).columns.power![3]).toBe(210);
  });

  it('keeps empty cells as NaN (dropout) and real zeros as zeros; warns about text cells with row and column', () => {
    const result = parseCsv(`time,power\n${rows(12, (i) => `${i},${i === 2 ? '' : i === 3 ? '0' : i === 4 ? 'n/a' : '200'}`)}`, 'gaps.csv');
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(Number.isNaN(result.recording.columns.power![2]!)).toBe(true);
    expect(result.recording.columns.power![3]).toBe(0);
    expect(result.recording.meta.dropouts).toBe(2);
    expect(result.warnings.find((w) => w.code === 'csv_bad_cell')?.message).toContain('row 6, column "power"');
  });

  it('drops rows whose time goes back, naming the row', () => {
    const result = parseCsv(`time,power\n${rows(12, (i) => `${i === 6 ? 2 : i},200`)}`, 'back.csv');
    expect(result.ok && result.recording.time.length).toBe(11);
    expect(result.ok && result.warnings.find((w) => w.code === 'csv_backward_time')?.where).toMatchObject({ file: 'back.csv', row: 8 });
  });
});

describe('parseCsv on a file larger than one parsing chunk', () => {
  it('keeps every row across chunk boundaries', () => {
    const n = 120_000; // ~1.5 MB, over the 1 MB chunk
    const rec = read(`time (s),power (W),cadence (rpm)\n${rows(n, (i) => `${i / 10},${200 + (i % 97)},${80 + (i % 13)}`)}\n`, 'long.csv');
    expect(rec.time.length).toBe(n);
    expect(rec.meta.sampleIntervalS).toBe(0.1);
    for (let i = 0; i < n; i += 997) {
      expect(rec.columns.power![i]).toBe(200 + (i % 97));
      expect(rec.columns.cadence![i]).toBe(80 + (i % 13));
      expect(rec.time[i]).toBe(i / 10);
    }
  });
});

describe('inspectCsv and the mapping schema', () => {
  it('lists columns, preview rows and a guessed mapping', () => {
    const info = inspectCsv(`Time (s),Power (W),Cadence (rpm),Speed (km/h),Notes\n0,200,90,36,x\n1,210,91,36,y\n`);
    expect(info.hasHeader).toBe(true);
    expect(info.columns.map((c) => [c.name, c.numeric])).toEqual([['Time (s)', true], ['Power (W)', true], ['Cadence (rpm)', true], ['Speed (km/h)', true], ['Notes', false]]);
    expect(info.previewRows).toEqual([['0', '200', '90', '36', 'x'], ['1', '210', '91', '36', 'y']]);
    expect(info.guessedMapping).toEqual({
      delimiter: ',', hasHeader: true, time: { column: 'Time (s)', format: 'seconds' },
      columns: [{ column: 'Power (W)', field: 'power', unit: 'W' }, { column: 'Cadence (rpm)', field: 'cadence', unit: 'rpm' }, { column: 'Speed (km/h)', field: 'speed', unit: 'km/h' }],
    });
    expect(info.warnings.map((w) => w.code)).toEqual(['csv_unknown_column']);
    expect(csvMappingSchema.parse(info.guessedMapping)).toEqual(info.guessedMapping);
  });

  it('an explicit mapping reads a file without a header row', () => {
    const mapping: CsvMapping = { hasHeader: false, time: { column: 'Column 1', format: 'seconds' }, columns: [{ column: 'Column 3', field: 'power', unit: 'kW' }] };
    const rec = read(rows(12, (i) => `${i},x,0.25`), 'bare.csv', mapping);
    expect(rec.columns.power![0]).toBe(250);
  });

  it('a mapping naming a missing column or a wrong unit is an error naming the column', () => {
    const csv = `time,power\n${rows(12, (i) => `${i},200`)}`;
    const missing = parseCsv(csv, 'm.csv', { time: { column: 'time', format: 'seconds' }, columns: [{ column: 'watts', field: 'power', unit: 'W' }] });
    expect(!missing.ok && missing.error.code).toBe('csv_mapping_column');
    expect(!missing.ok && missing.error.message).toContain('"watts"');
    const wrong = parseCsv(csv, 'm.csv', { time: { column: 'time', format: 'seconds' }, columns: [{ column: 'power', field: 'power', unit: 'rpm' }] });
    expect(!wrong.ok && wrong.error.code).toBe('mixed_units');
    expect(csvMappingSchema.safeParse({ time: { column: '', format: 'seconds' }, columns: [] }).success).toBe(false);
  });
});
