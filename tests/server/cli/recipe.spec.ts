import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Decoder, Stream } from '@garmin/fitsdk';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildNotebookExport } from '../../../shared/notebook/export-format.js';
import { writeFit } from '../../../shared/recording/write-fit.js';
import { deviceView } from '../../../shared/synthetic/device-view.js';
import { openDatabase, pgliteDirOf } from '../../../server/db/client.js';
import { insertNotebook } from '../../../server/db/repositories/notebooks.js';
import { storeUpload } from '../../../server/db/repositories/uploads.js';
import { user, workspace } from '../../../server/db/schema.js';
import { twoRingRide } from '../../shared/engine/rides.js';
import { recipeDoc } from '../helpers/recipe-notebook.js';
import { ROOT_DIR } from '../helpers/test-app.js';

interface Run {
  code: number;
  stdout: string;
  stderr: string;
}

function runRecipe(args: string[], env: Record<string, string> = {}): Promise<Run> {
  return new Promise((resolve) => {
    execFile(
      process.execPath,
      ['--import', 'tsx', 'server/cli/recipe.ts', ...args],
      { cwd: ROOT_DIR, timeout: 120_000, env: { ...process.env, DATABASE_URL: '', ...env } },
      (error, stdout, stderr) => resolve({ code: error === null ? 0 : typeof error.code === 'number' ? error.code : -1, stdout, stderr }),
    );
  });
}

/** Mean of the power field of every record, read with the FIT SDK's own decoder (not Cogbook's parser). */
function sdkMeanPower(bytes: Uint8Array): number {
  const { messages } = new Decoder(Stream.fromByteArray(Array.from(bytes))).read();
  const powers = (messages.recordMesgs ?? []).map((r: { power?: number }) => r.power).filter((p): p is number => typeof p === 'number');
  return powers.reduce((a, b) => a + b, 0) / powers.length;
}

type Cell = { name: string; state: string; values?: Record<string, number>; table?: { rows: number }; error?: unknown };

describe('recipe command', () => {
  let dir = '';
  const file = (name: string): string => join(dir, name);
  const ride = twoRingRide(7);
  const refBytes = writeFit(deviceView(ride, { label: 'reference', serialNumber: 1, noiseSdW: 3 }).recording);
  const crankBytes = writeFit(deviceView(ride, { label: 'crank', serialNumber: 2, noiseSdW: 3, gains: { left: [1, 1.06] } }).recording);

  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'cogbook-recipe-'));
    writeFileSync(file('reference.fit'), refBytes);
    writeFileSync(file('crank.fit'), crankBytes);
    writeFileSync(file('notes.txt'), 'this is not a recording\n');
    writeFileSync(file('recipe.cogbook.json'), JSON.stringify(buildNotebookExport(recipeDoc({ reference: null, test: null }), { exportedAt: new Date().toISOString() })));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('computes an exported notebook on two FIT files without a server: exit 0 and per-cell JSON', async () => {
    const run = await runRecipe(['--notebook', file('recipe.cogbook.json'), '--input', `reference=${file('reference.fit')}`, '--input', `test=${file('crank.fit')}`, '--out', file('results.json')]);
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const out = JSON.parse(readFileSync(file('results.json'), 'utf8')) as { failedCells: number; inputs: { slot: string; fileName: string }[]; cells: Cell[] };
    expect(out.failedCells).toBe(0);
    expect(out.inputs.map((i) => [i.slot, i.fileName])).toEqual([['reference', 'reference.fit'], ['test', 'crank.fit']]);
    expect(out.cells.map((c) => [c.name, c.state])).toEqual([['ref', 'fresh'], ['dut', 'fresh'], ['grid', 'fresh'], ['stats', 'fresh'], ['trace', 'fresh']]);
    const stats = out.cells.find((c) => c.name === 'stats')!.values!;
    // The FIT SDK stores whole watts: the means agree with its decoding to well under a watt.
    expect(stats['ref_mean']).toBeCloseTo(sdkMeanPower(refBytes), 1);
    expect(stats['dut_mean']).toBeCloseTo(sdkMeanPower(crankBytes), 1);
    // The crank reads its left leg 6% high on the big ring only, so its mean is above the reference's.
    expect(stats['diff_pct']).toBeGreaterThan(0.5);
    expect(stats['diff_pct']).toBeLessThan(3);
    expect(out.cells.find((c) => c.name === 'grid')!.table!.rows).toBeGreaterThan(100);
  }, 120_000);

  it('uses the recordings embedded in an export and writes to stdout', async () => {
    const embedded = buildNotebookExport(recipeDoc({ reference: null, test: null }), {
      exportedAt: new Date().toISOString(),
      recordings: [
        { slot: 'reference', fileName: 'reference.fit', format: 'fit', size: refBytes.byteLength, sha256: sha(refBytes), base64: Buffer.from(refBytes).toString('base64') },
      ],
    });
    writeFileSync(file('embedded.cogbook.json'), JSON.stringify(embedded));
    const run = await runRecipe(['--notebook', file('embedded.cogbook.json'), '--input', `test=${file('reference.fit')}`]);
    expect(run.code).toBe(0);
    const out = JSON.parse(run.stdout) as { cells: Cell[] };
    // The same file in both slots: no difference at all.
    expect(out.cells.find((c) => c.name === 'stats')!.values!['diff_pct']).toBe(0);
  }, 120_000);

  it('bad input exits 2 with one line naming the file and the problem', async () => {
    const notRecording = await runRecipe(['--notebook', file('recipe.cogbook.json'), '--input', `reference=${file('notes.txt')}`]);
    expect(notRecording.code).toBe(2);
    expect(notRecording.stderr.trim().split('\n')).toHaveLength(1);
    expect(notRecording.stderr).toMatch(/^recipe: .*notes\.txt/);
    const missing = await runRecipe(['--notebook', file('recipe.cogbook.json'), '--input', `reference=${file('nope.fit')}`]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toBe(`recipe: ${file('nope.fit')}: no such file\n`);
    const slot = await runRecipe(['--notebook', file('recipe.cogbook.json'), '--input', `rear=${file('crank.fit')}`]);
    expect(slot.code).toBe(2);
    expect(slot.stderr).toMatch(/no slot "rear"/);
    writeFileSync(file('newer.json'), JSON.stringify({ format: 'cogbook-notebook', formatVersion: 9, exportedAt: '', notebook: {} }));
    const newer = await runRecipe(['--notebook', file('newer.json')]);
    expect(newer.code).toBe(2);
    expect(newer.stderr).toMatch(/^recipe: .*newer\.json: this file uses export format version 9, but this Cogbook reads up to version 1/);
    const usage = await runRecipe(['--input', 'x']);
    expect(usage.code).toBe(2);
  }, 120_000);

  it('reads a notebook by id from DATA_DIR, and refuses while a server holds the folder', async () => {
    const dataDir = file('data');
    mkdirSync(dataDir);
    const database = await openDatabase({ pgliteDir: pgliteDirOf(dataDir), migrationsFolder: join(ROOT_DIR, 'drizzle') });
    const db = database.db;
    await db.insert(user).values({ id: 'u1', name: 'Lab analyst', email: 'a@lab.test' });
    const [ws] = await db.insert(workspace).values({ name: 'Lab' }).returning({ id: workspace.id });
    const stored = async (bytes: Uint8Array, name: string) =>
      (await storeUpload(db, { sha256: sha(bytes), fileName: name, format: 'fit', bytes, warnings: [], uploadedBy: 'u1', workspaceId: ws!.id })).record.id;
    const id = await insertNotebook(db, {
      workspaceId: ws!.id,
      ownerId: 'u1',
      title: 'Stored recipe',
      document: recipeDoc({ reference: await stored(refBytes, 'reference.fit'), test: await stored(crankBytes, 'crank.fit') }, 'Stored recipe'),
      summary: 'Created',
    });
    await database.close();

    const run = await runRecipe(['--notebook', id], { DATA_DIR: dataDir });
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const out = JSON.parse(run.stdout) as { notebook: { title: string }; cells: Cell[] };
    expect(out.notebook.title).toBe('Stored recipe');
    expect(out.cells.find((c) => c.name === 'stats')!.values!['ref_mean']).toBeCloseTo(sdkMeanPower(refBytes), 1);

    // A live process (this test runner) holds the lock, as a running server would.
    writeFileSync(join(dataDir, 'cogbook.lock'), `${process.pid}\n`);
    const locked = await runRecipe(['--notebook', id], { DATA_DIR: dataDir });
    expect(locked.code).toBe(2);
    expect(locked.stderr).toMatch(/^recipe: a Cogbook server is using .*; export the notebook/);
    rmSync(join(dataDir, 'cogbook.lock'));
  }, 120_000);
});

function sha(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}
