import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { notebookResponseSchema, revisionListResponseSchema } from '../../shared/api/notebooks.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';
import { notebookDoc } from './helpers/fixtures.js';

let t: TestApp;
let admin: Agent;
let analyst: Agent;
let workspaceId: string;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  admin = (await signUp(t, 'admin@lab.test', 'Ada Admin')).agent;
  analyst = (await signUp(t, 'analyst@lab.test', 'Ana Lyst')).agent;
  workspaceId = await personalWorkspaceOf(admin);
  await admin.post(`/api/workspaces/${workspaceId}/members`).send({ email: 'analyst@lab.test', role: 'analyst' }).expect(201);
});

async function create(agent: Agent, title = 'Crank vs hub'): Promise<string> {
  const res = await agent.post('/api/notebooks').send({ workspaceId, document: notebookDoc({ title }) }).expect(201);
  return notebookResponseSchema.parse(res.body).notebook.id;
}

describe('notebooks', () => {
  it('creates at revision 1 and answers the contract shape', async () => {
    const res = await analyst.post('/api/notebooks').send({ workspaceId, document: notebookDoc({ title: 'Left/right split' }) }).expect(201);
    const body = notebookResponseSchema.parse(res.body);
    expect(body.revision).toBe(1);
    expect(body.notebook).toMatchObject({ title: 'Left/right split', role: 'owner', owner: { name: 'Ana Lyst' }, workspace: { id: workspaceId } });
    expect(body.notebook.permissions).toEqual({ edit: true, manage: true });
  });

  it('refuses an invalid document with 400 and the field path', async () => {
    const res = await admin.post('/api/notebooks').send({ workspaceId, document: { ...notebookDoc(), title: '' } }).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.fields.map((f: { path: string }) => f.path)).toContain('document.title');
  });

  it('saves new revisions; a stale base answers 409 with the current number and overwrites nothing', async () => {
    const id = await create(admin);
    const first = await admin.put(`/api/notebooks/${id}`).send({ baseRevision: 1, document: notebookDoc({ title: 'By admin' }), summary: 'retitle' }).expect(200);
    expect(first.body.revision).toBe(2);

    const stale = await analyst.put(`/api/notebooks/${id}`).send({ baseRevision: 1, document: notebookDoc({ title: 'By analyst' }) }).expect(409);
    expect(stale.body.error.code).toBe('stale_revision');
    expect(stale.body.error.details).toEqual({ currentRevision: 2, baseRevision: 1 });

    const now = await admin.get(`/api/notebooks/${id}`).expect(200);
    expect(now.body.revision).toBe(2);
    expect(now.body.document.title).toBe('By admin');
    const history = revisionListResponseSchema.parse((await admin.get(`/api/notebooks/${id}/revisions`)).body);
    expect(history.revisions.map((r) => r.revision)).toEqual([2, 1]);
    expect(history.revisions[0]).toMatchObject({ summary: 'retitle', author: { name: 'Ada Admin' } });
  });

  it('of two concurrent saves on one base exactly one wins', async () => {
    const id = await create(admin);
    const [a, b] = await Promise.all([
      admin.put(`/api/notebooks/${id}`).send({ baseRevision: 1, document: notebookDoc({ title: 'A' }) }),
      analyst.put(`/api/notebooks/${id}`).send({ baseRevision: 1, document: notebookDoc({ title: 'B' }) }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const history = (await admin.get(`/api/notebooks/${id}/revisions`)).body.revisions;
    expect(history).toHaveLength(2);
  });

  it('restores an old revision as a new one, keeping history', async () => {
    const id = await create(admin, 'Original');
    await admin.put(`/api/notebooks/${id}`).send({ baseRevision: 1, document: notebookDoc({ title: 'Changed' }) }).expect(200);
    const restored = await analyst.post(`/api/notebooks/${id}/revisions/1/restore`).send({}).expect(200);
    expect(restored.body.revision).toBe(3);
    expect(restored.body.document.title).toBe('Original');
    expect(restored.body.notebook.title).toBe('Original');
    const rev2 = await admin.get(`/api/notebooks/${id}/revisions/2`).expect(200);
    expect(rev2.body.document.title).toBe('Changed');
    await admin.get(`/api/notebooks/${id}/revisions/9`).expect(404);
    const list = (await admin.get(`/api/notebooks/${id}/revisions`)).body.revisions;
    expect(list[0].summary).toBe('Restored revision 1');
  });

  it('lists notebooks the caller can see, newest first, with role and revision', async () => {
    const older = await create(admin, 'Older');
    const newer = await create(analyst, 'Newer');
    const res = await analyst.get('/api/notebooks').expect(200);
    expect(res.body.notebooks.map((n: { id: string }) => n.id)).toEqual([newer, older]);
    expect(res.body.notebooks[1]).toMatchObject({ role: 'editor', revision: 1, owner: { name: 'Ada Admin' } });
    const filtered = await analyst.get(`/api/notebooks?workspaceId=${encodeURIComponent('no-such-workspace')}`).expect(200);
    expect(filtered.body.notebooks).toEqual([]);
  });

  it('grants access to someone outside the workspace, and removing a member ends access at once', async () => {
    const id = await create(admin);
    const reviewer = await signUp(t, 'reviewer@elsewhere.test', 'Rev Iewer');
    await reviewer.agent.get(`/api/notebooks/${id}`).expect(404);
    const put = await admin.put(`/api/notebooks/${id}/access`).send({ grants: [{ email: 'Reviewer@Elsewhere.test', role: 'editor' }] }).expect(200);
    expect(put.body.grants.map((g: { role: string }) => g.role)).toEqual(['owner', 'editor']);
    const seen = await reviewer.agent.get(`/api/notebooks/${id}`).expect(200);
    expect(seen.body.notebook.role).toBe('editor');
    await reviewer.agent.put(`/api/notebooks/${id}`).send({ baseRevision: 1, document: notebookDoc() }).expect(200);
    const unknown = await admin.put(`/api/notebooks/${id}/access`).send({ grants: [{ email: 'ghost@nowhere.test', role: 'viewer' }] }).expect(404);
    expect(unknown.body.error.code).toBe('user_not_found');

    const members = (await admin.get(`/api/workspaces/${workspaceId}/members`)).body.members;
    const analystId = members.find((m: { user: { email: string } }) => m.user.email === 'analyst@lab.test').user.id;
    await analyst.get(`/api/notebooks/${id}`).expect(200);
    await admin.delete(`/api/workspaces/${workspaceId}/members/${analystId}`).expect(204);
    await analyst.get(`/api/notebooks/${id}`).expect(404);
  });

  it('lets an analyst delete the notebooks they own but not others', async () => {
    const mine = await create(analyst);
    const theirs = await create(admin);
    await analyst.delete(`/api/notebooks/${theirs}`).expect(403);
    await analyst.delete(`/api/notebooks/${mine}`).expect(204);
    await analyst.get(`/api/notebooks/${mine}`).expect(404);
  });

  it('keeps the last admin: demoting or removing them is refused', async () => {
    const me = (await admin.get('/api/me')).body.user.id as string;
    const res = await admin.patch(`/api/workspaces/${workspaceId}/members/${me}`).send({ role: 'viewer' }).expect(409);
    expect(res.body.error.code).toBe('last_admin');
    await admin.delete(`/api/workspaces/${workspaceId}/members/${me}`).expect(409);
  });

  it('adds members by e-mail only when the account exists, once', async () => {
    const missing = await admin.post(`/api/workspaces/${workspaceId}/members`).send({ email: 'nobody@lab.test', role: 'viewer' }).expect(404);
    expect(missing.body.error.message).toMatch(/sign up/);
    const twice = await admin.post(`/api/workspaces/${workspaceId}/members`).send({ email: 'analyst@lab.test', role: 'viewer' }).expect(409);
    expect(twice.body.error.code).toBe('already_member');
  });
});
