import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import type { EngineErrorData } from '../../../shared/errors.js';
import { importRecording } from '../../../shared/recording/import-recording.js';
import type { ImportOptions } from '../../../shared/recording/import-result.js';
import { generateFixtures } from '../../fixtures/generate.js';
import { handmadeFit, records } from './fit-helpers.js';

const crank = generateFixtures().find((f) => f.name === 'crank.fit')!.bytes;
const bad = (name: string): Uint8Array => new Uint8Array(readFileSync(new URL(`../../fixtures/bad/${name}`, import.meta.url)));

async function failure(bytes: Uint8Array, name: string, options: ImportOptions = {}): Promise<EngineErrorData> {
  const result = await importRecording(bytes, name, options);
  if (result.ok) throw new Error(`${name} was accepted`);
  expect(result.error.message).toContain(name);
  expect(result.error.where?.file).toBe(name);
  return result.error;
}

describe('importRecording refuses bad files with a code and a located message', () => {
  it('empty file', async () => {
    expect((await failure(new Uint8Array(0), 'empty.fit')).code).toBe('empty_file');
  });

  it('a file over the size limit', async () => {
    const error = await failure(crank, 'big.fit', { maxBytes: 1000 });
    expect(error.code).toBe('too_large');
    expect(error.message).toMatch(/over the limit of 1\.0 kB/);
  });

  it('binary that is not FIT, named .fit', async () => {
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    const error = await failure(png, 'photo.fit');
    expect(error.code).toBe('not_recording');
    expect(error.message).toContain('named .fit but is not a FIT file');
    expect(error.where?.byte).toBe(0);
  });

  it('a truncated FIT file; readDamaged reads the intact part with a warning', async () => {
    const cut = crank.slice(0, Math.floor(crank.length * 0.6));
    const error = await failure(cut, 'cut.fit');
    expect(error.code).toBe('fit_truncated');
    expect(error.where?.byte).toBe(cut.length);
    expect(error.message).toContain(`ends at byte ${cut.length}`);
    const result = await importRecording(cut, 'cut.fit', { readDamaged: true });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.warnings.map((w) => w.code)).toContain('fit_truncated');
    const full = await importRecording(crank, 'crank.fit');
    expect(full.ok && result.recording.time.length < full.recording.time.length && result.recording.time.length > 100).toBe(true);
  });

  it('a FIT file whose CRC fails; the error offers reading it anyway', async () => {
    const damaged = crank.slice();
    damaged[Math.floor(damaged.length / 2)]! ^= 0x01;
    const error = await failure(damaged, 'flip.fit');
    expect(error.code).toBe('fit_crc');
    expect(error.message).toContain('read damaged file');
    expect(error.where?.byte).toBe(damaged.length - 2);
    const result = await importRecording(damaged, 'flip.fit', { readDamaged: true });
    expect(result.ok && result.warnings.some((w) => w.code === 'fit_crc')).toBe(true);
  });

  it('a FIT file without power, unless allowNoPower', async () => {
    const bytes = handmadeFit(records(20, Date.UTC(2026, 0, 1), () => ({ cadence: 85, heartRate: 120 })));
    const error = await failure(bytes, 'hr-only.fit');
    expect(error.code).toBe('no_power');
    expect(error.where?.field).toBe('power');
    const allowed = await importRecording(bytes, 'hr-only.fit', { allowNoPower: true });
    expect(allowed.ok).toBe(true);
  });

  it('a 3-record FIT file is too short, and says how many are needed', async () => {
    const error = await failure(handmadeFit(records(3, Date.UTC(2026, 0, 1))), 'three.fit');
    expect(error.code).toBe('too_short');
    expect(error.message).toContain('only 3 samples');
    expect(error.message).toContain('at least 10');
  });

  it('CSV with a header only', async () => {
    const error = await failure(bad('header-only.csv'), 'header-only.csv');
    expect(error.code).toBe('header_only');
    expect(error.where?.row).toBe(2);
  });

  it('CSV with no numeric columns', async () => {
    expect((await failure(bad('no-numbers.csv'), 'no-numbers.csv')).code).toBe('no_numeric_columns');
  });

  it('CSV without a time column', async () => {
    const error = await failure(bad('no-time.csv'), 'no-time.csv');
    expect(error.code).toBe('no_time_column');
    expect(error.message).toContain('"power (W)"');
  });

  it('CSV with two power columns in different units', async () => {
    const error = await failure(bad('two-power-units.csv'), 'two-power-units.csv');
    expect(error.code).toBe('mixed_units');
    expect(error.message).toContain('"power (W)" (W) and "power (kW)" (kW, row 1, column 3)');
  });

  it('CSV with a power column whose unit cannot be decided', async () => {
    const error = await failure(bad('power-unit-unknown.csv'), 'power-unit-unknown.csv');
    expect(error.code).toBe('mixed_units');
    expect(error.message).toContain('"power [hp]" (row 1, column 2)');
  });

  it('CSV with 3 rows is too short', async () => {
    expect((await failure(bad('three-rows.csv'), 'three-rows.csv')).code).toBe('too_short');
  });
});

describe('importRecording detects the format by content', () => {
  it('reads FIT bytes named .csv as FIT, with a warning', async () => {
    const result = await importRecording(crank, 'export.csv');
    expect(result.ok && result.recording.meta.format).toBe('fit');
    expect(result.ok && result.warnings.map((w) => w.code)).toContain('extension_mismatch');
  });

  it('reads CSV text named .fit as CSV, with a warning', async () => {
    const text = new TextEncoder().encode(`time (s),power (W)\n${Array.from({ length: 20 }, (_, i) => `${i},${200 + i}`).join('\n')}\n`);
    const result = await importRecording(text, 'renamed.fit');
    expect(result.ok && result.recording.meta.format).toBe('csv');
    expect(result.ok && result.warnings.map((w) => w.code)).toContain('extension_mismatch');
  });
});
