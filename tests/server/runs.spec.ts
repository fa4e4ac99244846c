import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { runCompareResponseSchema, runListResponseSchema, runResponseSchema } from '../../shared/api/runs.js';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

let t: TestApp;
let analyst: Agent;
let workspaceId: string;

async function upload(agent: Agent, seconds: number, watts: number, name: string): Promise<string> {
  const res = await agent.post('/api/uploads').field('workspaceId', workspaceId).attach('file', Buffer.from(fitBytes(seconds, watts)), name).expect(201);
  return res.body.uploads[0].id as string;
}

/** Mean of watts, watts+1, ..., watts+seconds-1 (what fitBytes writes): arithmetic series, (first + last) / 2. */
const seriesMean = (seconds: number, watts: number) => (watts + (watts + seconds - 1)) / 2;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  analyst = (await signUp(t, 'analyst@lab.test')).agent;
  workspaceId = await personalWorkspaceOf(analyst);
});

async function recipeNotebook(): Promise<{ id: string; reference: string }> {
  const reference = await upload(analyst, 30, 200, 'reference.fit');
  const nb = await analyst.post('/api/notebooks').send({ workspaceId, document: recipeDoc({ reference, test: null }) }).expect(201);
  return { id: nb.body.notebook.id as string, reference };
}

describe('recipe runs', () => {
  it('re-runs the recipe on two new uploads: two runs listed, values follow the files', async () => {
    const { id, reference } = await recipeNotebook();
    const testA = await upload(analyst, 30, 210, 'crank-a.fit');
    const testB = await upload(analyst, 30, 230, 'crank-b.fit');
    const a = await analyst.post(`/api/notebooks/${id}/runs`).send({ bindings: { test: testA }, label: 'crank A' }).expect(201);
    const b = await analyst.post(`/api/notebooks/${id}/runs`).send({ bindings: { test: testB }, label: 'crank B' }).expect(201);
    const runA = runResponseSchema.parse(a.body);
    const runB = runResponseSchema.parse(b.body);
    expect(runA.bindings).toEqual([
      { slot: 'reference', uploadId: reference, fileName: 'reference.fit' },
      { slot: 'test', uploadId: testA, fileName: 'crank-a.fit' },
    ]);
    const stats = (run: typeof runA) => run.snapshot.cells.find((c) => c.name === 'stats')!.result as { type: 'values'; values: Record<string, number> };
    expect(stats(runA).values['ref_mean']).toBeCloseTo(seriesMean(30, 200), 9);
    expect(stats(runA).values['dut_mean']).toBeCloseTo(seriesMean(30, 210), 9);
    expect(stats(runB).values['dut_mean']).toBeCloseTo(seriesMean(30, 230), 9);
    // (224.5 - 214.5) / 214.5 * 100 and (244.5 - 214.5) / 214.5 * 100, by hand.
    expect(stats(runA).values['diff_pct']).toBeCloseTo((10 / 214.5) * 100, 9);
    expect(stats(runB).values['diff_pct']).toBeCloseTo((30 / 214.5) * 100, 9);
    expect(runA.failedCells).toBe(0);
    expect(runA.snapshot.inputs.map((i) => i.fileName)).toEqual(['reference.fit', 'crank-a.fit']);

    const list = runListResponseSchema.parse((await analyst.get(`/api/notebooks/${id}/runs`).expect(200)).body);
    expect(list.runs.map((r) => r.label)).toEqual(['crank B', 'crank A']);
    expect(list.runs.every((r) => r.revision === 1)).toBe(true);

    const got = runResponseSchema.parse((await analyst.get(`/api/runs/${runA.id}`).expect(200)).body);
    expect(got.snapshot).toEqual(runA.snapshot);
  });

  it('compares one output across runs, oldest first, for a table and a chart', async () => {
    const { id } = await recipeNotebook();
    for (const [watts, label] of [[205, 'first'], [215, 'second']] as const) {
      const test = await upload(analyst, 30, watts, `${label}.fit`);
      await analyst.post(`/api/notebooks/${id}/runs`).send({ bindings: { test }, label }).expect(201);
    }
    const res = runCompareResponseSchema.parse((await analyst.get(`/api/notebooks/${id}/runs/compare`).query({ path: 'stats.dut_mean' }).expect(200)).body);
    expect(res.rows.map((r) => [r.label, r.value])).toEqual([
      ['first', seriesMean(30, 205)],
      ['second', seriesMean(30, 215)],
    ]);
    const column = (await analyst.get(`/api/notebooks/${id}/runs/compare`).query({ path: 'grid.power.max' }).expect(200)).body;
    expect(column.rows.map((r: { value: number }) => r.value)).toEqual([229, 229]);
    const missing = (await analyst.get(`/api/notebooks/${id}/runs/compare`).query({ path: 'nosuchcell.x' }).expect(200)).body;
    expect(missing.rows.map((r: { problem: string }) => r.problem)).toEqual(['missing', 'missing']);
  });

  it('keeps snapshots bounded: table head of 20 rows with stats, chart data reduced, no raw samples', async () => {
    const { id } = await recipeNotebook();
    const test = await upload(analyst, 3000, 150, 'long.fit');
    const reference = await upload(analyst, 3000, 160, 'long-ref.fit');
    const run = runResponseSchema.parse((await analyst.post(`/api/notebooks/${id}/runs`).send({ bindings: { reference, test } }).expect(201)).body);
    const grid = run.snapshot.cells.find((c) => c.name === 'grid')!.result!;
    if (grid.type !== 'table') throw new Error('grid should be a table');
    expect(grid.table.rows).toBe(3000);
    expect(grid.head.rows).toHaveLength(20);
    expect(grid.head.rows[0]![0]).toBe(0);
    const chart = run.snapshot.cells.find((c) => c.name === 'trace')!.result!;
    if (chart.type !== 'chart') throw new Error('trace should be a chart');
    const datasets = Object.values((chart.spec as { datasets?: Record<string, unknown[]> }).datasets ?? {});
    const rows = datasets.reduce((n, d) => n + d.length, 0) + (((chart.spec as { data?: { values?: unknown[] } }).data?.values?.length) ?? 0);
    expect(rows).toBeGreaterThan(0);
    for (const d of datasets) expect(d.length).toBeLessThanOrEqual(2000 * 2);
    // 3000 s of two 1 Hz files: far below the raw size (each FIT is ~ 30 kB).
    expect(JSON.stringify(run.snapshot).length).toBeLessThan(400_000);
  });

  it('downloads a table cell of a run as CSV, every row', async () => {
    const { id } = await recipeNotebook();
    const run = (await analyst.post(`/api/notebooks/${id}/runs`).send({}).expect(201)).body;
    const res = await analyst.get(`/api/runs/${run.id}/cells/c3.csv`).expect(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const lines = res.text.trim().split('\n');
    expect(lines[0]).toMatch(/^time_s,/);
    expect(lines).toHaveLength(31);
    await analyst.get(`/api/runs/${run.id}/cells/c4.csv`).expect(400);
    await analyst.get(`/api/runs/${run.id}/cells/nope.csv`).expect(404);
  });

  it('refuses unknown slots, unreadable uploads and files that are not recordings', async () => {
    const { id } = await recipeNotebook();
    const bad = await analyst.post(`/api/notebooks/${id}/runs`).send({ bindings: { rear: 'x' } }).expect(400);
    expect(bad.body.error.code).toBe('unknown_slot');
    const stranger = (await signUp(t, 'stranger@else.test')).agent;
    const theirs = (await stranger.post('/api/uploads').attach('file', Buffer.from(fitBytes(20, 99)), 'theirs.fit').expect(201)).body.uploads[0].id;
    await analyst.post(`/api/notebooks/${id}/runs`).send({ bindings: { test: theirs } }).expect(404);
    const csv = (await analyst.post('/api/uploads').field('workspaceId', workspaceId).attach('file', Buffer.from('time,cadence\n0,90\n1,91\n'), 'short.csv').expect(201)).body.uploads[0].id;
    const unreadable = await analyst.post(`/api/notebooks/${id}/runs`).send({ bindings: { test: csv } }).expect(400);
    expect(unreadable.body.error.code).toBe('input_unreadable');
    expect(unreadable.body.error.message).toMatch(/short\.csv/);
    expect((await analyst.get(`/api/notebooks/${id}/runs`)).body.runs).toEqual([]);
  });

  it('an empty slot blocks its cells instead of failing the run', async () => {
    const { id } = await recipeNotebook();
    const run = runResponseSchema.parse((await analyst.post(`/api/notebooks/${id}/runs`).send({}).expect(201)).body);
    const dut = run.snapshot.cells.find((c) => c.name === 'dut')!;
    expect(dut.state).toBe('blocked');
    expect(dut.blockedBy).toMatchObject({ name: 'test', reason: 'empty_slot' });
  });
});
