import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCompareArgs } from '../../server/cli/compare-args.js';
import { computeNotebook } from '../../server/engine/compute-notebook.js';
import { compareRecordings } from '../../shared/engine/compare.js';
import { compareReportSchema } from '../../shared/engine/compare-report.js';
import { buildNotebookExport } from '../../shared/notebook/export-format.js';
import { importRecording } from '../../shared/recording/import-recording.js';
import type { Recording } from '../../shared/recording/recording.js';
import { truncatedFit } from '../fixtures/bad-fit.js';
import { generateFixtures } from '../fixtures/generate.js';
import { recipeDoc } from '../server/helpers/recipe-notebook.js';
import { ROOT_DIR } from '../server/helpers/test-app.js';

/**
 * The command-line tools as users run them after `npm run build:node` (which `npm test` and
 * `npm run test:security` run first): the minified compare bundle and the compiled recipe
 * command, under plain `node` with no TypeScript loader, on the fixture files (FIT and CSV).
 * Their output must be what the engine computes in this process for the same files.
 */
const COMPARE = join(ROOT_DIR, 'dist/node/server/cli/compare.js');
const RECIPE = join(ROOT_DIR, 'dist/node/server/cli/recipe.js');

interface Run {
  code: number;
  stdout: string;
  stderr: string;
}

/** Plain node: no --import, and NODE_OPTIONS cleared so no loader the test runner may have set comes along. */
function runBuilt(script: string, args: string[]): Promise<Run> {
  return new Promise((resolve) => {
    execFile(
      process.execPath,
      [script, ...args],
      { cwd: tmpdir(), timeout: 120_000, env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? tmpdir(), DATABASE_URL: '', NODE_OPTIONS: '' } },
      (error, stdout, stderr) => resolve({ code: error === null ? 0 : typeof error.code === 'number' ? error.code : -1, stdout, stderr }),
    );
  });
}

/** Every leaf of a JSON value by its path (`comparisons.0.agreement.biasW`), so a difference names its field. */
function leaves(value: unknown, path = '', out: Record<string, unknown> = {}): Record<string, unknown> {
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value);
    if (entries.length === 0) out[path] = Array.isArray(value) ? [] : {};
    for (const [key, v] of entries) leaves(v, path === '' ? key : `${path}.${key}`, out);
  } else out[path] = value;
  return out;
}

async function recordingOf(bytes: Uint8Array, name: string): Promise<Recording> {
  const result = await importRecording(bytes, name);
  if (!result.ok) throw new Error(result.error.message);
  return result.recording;
}

const sha256 = (bytes: Uint8Array): string => createHash('sha256').update(bytes).digest('hex');

describe('built command-line tools under plain node', () => {
  const fixtures = new Map(generateFixtures().map((f) => [f.name, f.bytes]));
  const referenceBytes = fixtures.get('reference.fit')!;
  const csvBytes = fixtures.get('crank-seconds-kmh.csv')!;
  let dir = '';
  const file = (name: string): string => join(dir, name);

  beforeAll(() => {
    for (const script of [COMPARE, RECIPE]) {
      if (!existsSync(script)) throw new Error(`${script} is missing: run \`npm run build:node\` first (npm test and npm run test:security do)`);
    }
    // compare.js is the bundle's loader, not tsc's output of compare.ts.
    expect(readFileSync(COMPARE, 'utf8')).toContain('compare-bundle.cjs');
    dir = mkdtempSync(join(tmpdir(), 'cogbook-built-cli-'));
    writeFileSync(file('reference.fit'), referenceBytes);
    writeFileSync(file('crank-seconds-kmh.csv'), csvBytes);
    writeFileSync(file('damaged.fit'), truncatedFit(referenceBytes, 200));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('compare --json on a FIT reference and a CSV device prints, field by field, what the engine computes in process', async () => {
    const argv = ['--reference', file('reference.fit'), '--test', file('crank-seconds-kmh.csv'), '--json', '--seed', '5', '--tolerance', '1.5'];
    const run = await runBuilt(COMPARE, argv);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const printed = leaves(JSON.parse(run.stdout));

    const options = parseCompareArgs(argv).options;
    const report = compareRecordings(await recordingOf(referenceBytes, 'reference.fit'), [await recordingOf(csvBytes, 'crank-seconds-kmh.csv')], options);
    const expected = leaves(JSON.parse(JSON.stringify(compareReportSchema.parse(report))));

    expect(Object.keys(printed).sort()).toEqual(Object.keys(expected).sort());
    for (const [path, value] of Object.entries(expected)) expect(printed[path], path).toStrictEqual(value);
    // Not a vacuous match: the report has both files, the options given, and a full comparison.
    expect(Object.keys(printed).length).toBeGreaterThan(200);
    expect(printed['reference.format']).toBe('fit');
    expect(printed['comparisons.0.test.format']).toBe('csv');
    expect(printed['options.seed']).toBe(5);
    expect(printed['options.tolerancePct']).toBe(1.5);
    expect(printed['comparisons.0.pairedSeconds']).toBeGreaterThan(500); // most of the 12 min fixture ride
  });

  it('compare on a damaged FIT file exits with 2 and one line saying what is wrong with it', async () => {
    const run = await runBuilt(COMPARE, ['--reference', file('damaged.fit'), '--test', file('crank-seconds-kmh.csv'), '--json']);
    expect(run.code).toBe(2);
    expect(run.stdout).toBe('');
    expect(run.stderr.trim().split('\n')).toHaveLength(1);
    expect(run.stderr).toMatch(/^compare: damaged\.fit is cut short: .* the file ends at byte \d+ \(expected \d+\)/);
    expect(run.stderr).not.toMatch(/\bat .*:\d+:\d+/);
  });

  it('compare on a missing file exits with 2 and names the file', async () => {
    const run = await runBuilt(COMPARE, ['--reference', file('reference.fit'), '--test', file('nowhere.csv')]);
    expect(run.code).toBe(2);
    expect(run.stdout).toBe('');
    expect(run.stderr).toBe(`compare: ${file('nowhere.csv')}: no such file\n`);
  });

  it('recipe computes an exported notebook on the FIT and CSV fixtures as the server computes it in process', async () => {
    const document = recipeDoc({ reference: null, test: null });
    writeFileSync(file('recipe.cogbook.json'), JSON.stringify(buildNotebookExport(document, { exportedAt: new Date().toISOString() })));
    const run = await runBuilt(RECIPE, ['--notebook', file('recipe.cogbook.json'), '--input', `reference=${file('reference.fit')}`, '--input', `test=${file('crank-seconds-kmh.csv')}`]);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const out = JSON.parse(run.stdout) as { failedCells: number; inputs: { slot: string; sha256: string }[]; cells: { name: string; state: string; values?: Record<string, number>; table?: { rows: number } }[] };
    expect(out.failedCells).toBe(0);
    expect(out.inputs).toEqual([
      expect.objectContaining({ slot: 'reference', sha256: sha256(referenceBytes) }),
      expect.objectContaining({ slot: 'test', sha256: sha256(csvBytes) }),
    ]);

    const inputs = [
      { slot: 'reference', fileName: 'reference.fit', format: 'fit' as const, bytes: referenceBytes },
      { slot: 'test', fileName: 'crank-seconds-kmh.csv', format: 'csv' as const, bytes: csvBytes },
    ].map((i) => ({ ...i, label: document.slots.find((s) => s.name === i.slot)!.label, sha256: sha256(i.bytes), size: i.bytes.byteLength }));
    const outcome = await computeNotebook({ document, revision: 1, inputs });
    if (!outcome.ok) throw new Error(outcome.error.message);
    const cells = outcome.snapshot.cells;
    expect(out.cells.map((c) => [c.name, c.state])).toEqual(cells.map((c) => [c.name, c.state]));
    expect(out.cells.map((c) => c.state)).toEqual(['fresh', 'fresh', 'fresh', 'fresh', 'fresh']);
    const stats = cells.find((c) => c.name === 'stats')!.result;
    if (stats?.type !== 'values') throw new Error('the stats cell computed no values');
    expect(out.cells.find((c) => c.name === 'stats')!.values).toStrictEqual(stats.values);
    expect(stats.values['ref_mean']).toBeGreaterThan(100);
    const grid = cells.find((c) => c.name === 'grid')!.result;
    expect(out.cells.find((c) => c.name === 'grid')!.table!.rows).toBe(grid?.type === 'table' ? grid.table.rows : -1);
  });
});
