import supertest from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { notebookResponseSchema } from '../../shared/api/notebooks.js';
import { shareLinkSchema, sharedNotebookResponseSchema } from '../../shared/api/shares.js';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

let t: TestApp;
let owner: Agent;
let labId: string;
let notebookId: string;
let referenceId: string;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  owner = (await signUp(t, 'owner@lab.test')).agent;
  labId = await personalWorkspaceOf(owner);
  referenceId = (await owner.post('/api/uploads').field('workspaceId', labId).attach('file', Buffer.from(fitBytes(20, 200)), 'reference.fit').expect(201)).body.uploads[0].id;
  notebookId = (await owner.post('/api/notebooks').send({ workspaceId: labId, document: recipeDoc({ reference: referenceId, test: null }) }).expect(201)).body.notebook.id;
});

describe('share links', () => {
  it('a token opens the notebook read-only for anyone, with its newest run; revoked -> 404', async () => {
    const share = shareLinkSchema.parse((await owner.post(`/api/notebooks/${notebookId}/shares`).send({}).expect(201)).body);
    expect(share.url).toBe(`${t.config.baseUrl}/shared/${share.token}`);
    expect(share.membersOnly).toBe(false);
    const anon = supertest(t.app);
    const before = sharedNotebookResponseSchema.parse((await anon.get(`/api/shared/${share.token}`).expect(200)).body);
    expect(before.document.title).toBe('Mean power, reference vs device');
    expect(before.snapshot).toBeNull();
    await owner.post(`/api/notebooks/${notebookId}/runs`).send({ label: 'first' }).expect(201);
    const after = sharedNotebookResponseSchema.parse((await anon.get(`/api/shared/${share.token}`).expect(200)).body);
    expect(after.snapshotSource).toBe('run');
    expect(after.snapshot!.cells.find((c) => c.name === 'ref')!.state).toBe('fresh');
    // Read-only: the token gives no way to save.
    await anon.put(`/api/notebooks/${notebookId}`).send({ baseRevision: 1, document: after.document }).expect(401);
    const list = (await owner.get(`/api/notebooks/${notebookId}/shares`).expect(200)).body.shares;
    expect(list.map((s: { token: string }) => s.token)).toEqual([share.token]);
    await owner.delete(`/api/shares/${share.token}`).expect(204);
    await anon.get(`/api/shared/${share.token}`).expect(404);
    await owner.delete(`/api/shares/${share.token}`).expect(404);
    expect((await owner.get(`/api/notebooks/${notebookId}/shares`)).body.shares).toEqual([]);
  });

  it('an unknown token answers 404 with the error shape', async () => {
    const res = await supertest(t.app).get('/api/shared/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA').expect(404);
    expect(res.body.error.code).toBe('not_found');
  });

  it('a members-only link refuses outsiders (404) and signed-out callers (401), opens for members', async () => {
    const { token } = (await owner.post(`/api/notebooks/${notebookId}/shares`).send({ membersOnly: true }).expect(201)).body;
    await supertest(t.app).get(`/api/shared/${token}`).expect(401);
    const outsider = (await signUp(t, 'outsider@else.test')).agent;
    await outsider.get(`/api/shared/${token}`).expect(404);
    await outsider.post(`/api/shared/${token}/fork`).send({ workspaceId: await personalWorkspaceOf(outsider) }).expect(404);
    await signUp(t, 'member@lab.test').then(async ({ agent }) => {
      await owner.post(`/api/workspaces/${labId}/members`).send({ email: 'member@lab.test', role: 'viewer' }).expect(201);
      const res = sharedNotebookResponseSchema.parse((await agent.get(`/api/shared/${token}`).expect(200)).body);
      expect(res.membersOnly).toBe(true);
    });
  });
});

describe('forks', () => {
  it('forks into the caller workspace with provenance; the original keeps its revision and document', async () => {
    const original = (await owner.get(`/api/notebooks/${notebookId}`).expect(200)).body;
    const { agent: other } = await signUp(t, 'other@else.test');
    await owner.put(`/api/notebooks/${notebookId}/access`).send({ grants: [{ email: 'other@else.test', role: 'viewer' }] }).expect(200);
    const theirs = await personalWorkspaceOf(other);
    const fork = notebookResponseSchema.parse((await other.post(`/api/notebooks/${notebookId}/fork`).send({ workspaceId: theirs }).expect(201)).body);
    expect(fork.notebook.forkedFrom).toEqual({ notebookId, id: notebookId, title: original.notebook.title, revision: 1 });
    expect(fork.notebook.workspace.id).toBe(theirs);
    expect(fork.notebook.role).toBe('owner');
    expect(fork.document.title).toBe(`${original.document.title} (copy)`);
    expect(fork.document.slots).toEqual(original.document.slots);
    expect(fork.document.cells).toEqual(original.document.cells);
    // The forker may read the stored upload the fork binds, and run the fork.
    await other.get(`/api/uploads/${referenceId}`).expect(200);
    await other.post(`/api/notebooks/${fork.notebook.id}/runs`).send({}).expect(201);
    const after = (await owner.get(`/api/notebooks/${notebookId}`).expect(200)).body;
    expect(after.revision).toBe(original.revision);
    expect(after.document).toEqual(original.document);
    expect((await owner.get(`/api/notebooks/${notebookId}/revisions`)).body.revisions).toHaveLength(1);
  });

  it('forks through a share token without any grant; needs admin/analyst in the target workspace', async () => {
    const { token } = (await owner.post(`/api/notebooks/${notebookId}/shares`).send({}).expect(201)).body;
    const { agent: reader } = await signUp(t, 'reader@else.test');
    await reader.post(`/api/notebooks/${notebookId}/fork`).send({ workspaceId: await personalWorkspaceOf(reader) }).expect(404);
    await reader.post(`/api/shared/${token}/fork`).send({ workspaceId: labId }).expect(404);
    await supertest(t.app).post(`/api/shared/${token}/fork`).send({ workspaceId: labId }).expect(401);
    const fork = (await reader.post(`/api/shared/${token}/fork`).send({ workspaceId: await personalWorkspaceOf(reader), title: 'My copy' }).expect(201)).body;
    expect(fork.notebook.title).toBe('My copy');
    expect(fork.notebook.forkedFrom.revision).toBe(1);
    await reader.get(`/api/uploads/${referenceId}/content`).expect(200);
  });
});
