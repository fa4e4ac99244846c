import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { notebookListResponseSchema } from '../../shared/api/notebooks.js';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

let t: TestApp;
let analyst: Agent;
let workspaceId: string;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  analyst = (await signUp(t, 'analyst@lab.test')).agent;
  workspaceId = await personalWorkspaceOf(analyst);
});

describe('GET /api/notebooks: inputs and last run', () => {
  it("lists each notebook's slot labels with the bound file and its device, and the last run", async () => {
    const up = await analyst.post('/api/uploads').field('workspaceId', workspaceId).attach('file', Buffer.from(fitBytes(30, 200)), 'hub.fit').expect(201);
    const reference = up.body.uploads[0].id as string;
    const nb = await analyst.post('/api/notebooks').send({ workspaceId, document: recipeDoc({ reference, test: null }) }).expect(201);
    const id = nb.body.notebook.id as string;

    let list = notebookListResponseSchema.parse((await analyst.get('/api/notebooks').expect(200)).body);
    const [item] = list.notebooks;
    // Labels as recipeDoc writes them; serial 4242 is the file_id that fitBytes encodes with the FIT SDK.
    expect(item!.inputs).toEqual([
      { slot: 'reference', label: 'Reference hub', fileName: 'hub.fit', device: expect.objectContaining({ serialNumber: 4242 }) },
      { slot: 'test', label: 'Crank under test', fileName: null, device: null },
    ]);
    expect(item!.inputs[0]!.device!.name).toContain('serial 4242');
    expect(item!.lastRunAt).toBeNull();

    const run = await analyst.post(`/api/notebooks/${id}/runs`).send({ bindings: { test: reference } }).expect(201);
    list = notebookListResponseSchema.parse((await analyst.get('/api/notebooks').expect(200)).body);
    expect(list.notebooks[0]!.lastRunAt).toBe(run.body.createdAt);
  });
});
