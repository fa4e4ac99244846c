import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { emptyNotebook } from '../../shared/notebook/document.js';
import { fitBytes } from '../server/helpers/fixtures.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from '../server/helpers/test-app.js';

/**
 * Ids from another workspace. tests/server/role-matrix.spec.ts covers notebooks,
 * revisions, access, uploads, members and the outbox (its "outsider" column is 404
 * everywhere); this adds the routes of working together (runs, shares, exports, forks,
 * publications) and ids smuggled in through request bodies.
 */
let t: TestApp;
let lab: Agent;
let outsider: Agent;
let labWorkspace: string;
let outsiderWorkspace: string;
let notebookId: string;
let uploadId: string;
let runId: string;
let shareToken: string;
let labUserId: string;

beforeAll(async () => {
  t = await createTestApp();
  const a = await signUp(t, 'lab.admin@lab.test');
  lab = a.agent;
  labUserId = a.userId;
  outsider = (await signUp(t, 'outsider@elsewhere.test')).agent;
  labWorkspace = await personalWorkspaceOf(lab);
  outsiderWorkspace = await personalWorkspaceOf(outsider);
  uploadId = (await lab.post('/api/uploads').field('workspaceId', labWorkspace).attach('file', Buffer.from(fitBytes(20, 310)), 'secret-ride.fit').expect(201)).body.uploads[0].id;
  const document = { ...emptyNotebook('Lab secrets'), slots: [{ id: 's1', name: 'reference', label: 'Reference', uploadId }] };
  notebookId = (await lab.post('/api/notebooks').send({ workspaceId: labWorkspace, document }).expect(201)).body.notebook.id;
  const run = await lab.post(`/api/notebooks/${notebookId}/runs`).send({});
  expect(run.status, run.text).toBe(201);
  runId = run.body.id ?? run.body.run?.id;
  const share = await lab.post(`/api/notebooks/${notebookId}/shares`).send({ membersOnly: true });
  expect(share.status, share.text).toBe(201);
  shareToken = share.body.token ?? share.body.share?.token;
  expect(runId).toBeTruthy();
  expect(shareToken).toBeTruthy();
});
afterAll(async () => t?.close());

describe('ids of another workspace answer 404', () => {
  const cases: [string, () => Promise<{ status: number; body: { error?: { code: string } } }>][] = [
    ['GET /api/notebooks/:id/export', () => outsider.get(`/api/notebooks/${notebookId}/export`)],
    ['POST /api/notebooks/:id/fork', () => outsider.post(`/api/notebooks/${notebookId}/fork`).send({ workspaceId: outsiderWorkspace })],
    ['POST /api/notebooks/:id/runs', () => outsider.post(`/api/notebooks/${notebookId}/runs`).send({})],
    ['GET /api/notebooks/:id/runs', () => outsider.get(`/api/notebooks/${notebookId}/runs`)],
    ['GET /api/notebooks/:id/runs/compare', () => outsider.get(`/api/notebooks/${notebookId}/runs/compare?path=x`)],
    ['GET /api/runs/:id', () => outsider.get(`/api/runs/${runId}`)],
    ['GET /api/runs/:id/cells/:cellId.csv', () => outsider.get(`/api/runs/${runId}/cells/c1.csv`)],
    ['POST /api/notebooks/:id/shares', () => outsider.post(`/api/notebooks/${notebookId}/shares`).send({})],
    ['GET /api/notebooks/:id/shares', () => outsider.get(`/api/notebooks/${notebookId}/shares`)],
    ['DELETE /api/shares/:token', () => outsider.delete(`/api/shares/${shareToken}`)],
    ['GET /api/shared/:token (members only)', () => outsider.get(`/api/shared/${shareToken}`)],
    ['POST /api/notebooks/:id/publication', () => outsider.post(`/api/notebooks/${notebookId}/publication`).send({})],
    ['GET /api/notebooks/:id/publication', () => outsider.get(`/api/notebooks/${notebookId}/publication`)],
    ['DELETE /api/notebooks/:id/publication', () => outsider.delete(`/api/notebooks/${notebookId}/publication`)],
    ['GET /api/workspaces/:id/members', () => outsider.get(`/api/workspaces/${labWorkspace}/members`)],
    ['PATCH /api/workspaces/:id/members/:userId', () => outsider.patch(`/api/workspaces/${labWorkspace}/members/${labUserId}`).send({ role: 'viewer' })],
  ];
  for (const [name, run] of cases) {
    it(name, async () => {
      const res = await run();
      expect(res.status, JSON.stringify(res.body)).toBe(404);
      expect(res.body.error?.code).toMatch(/not_found/);
    });
  }

  it('the share link still works for the lab and was not revoked by the outsider', async () => {
    await lab.get(`/api/shared/${shareToken}`).expect(200);
  });
});

describe('ids smuggled in through a body', () => {
  it('cannot bind another workspace’s upload to a notebook and then read it', async () => {
    const document = { ...emptyNotebook('Borrowed'), slots: [{ id: 's1', name: 'reference', label: 'Stolen', uploadId }] };
    const created = await outsider.post('/api/notebooks').send({ workspaceId: outsiderWorkspace, document });
    expect(created.status, created.text).toBe(404);
    expect(created.body.error.code).toBe('not_found');
    // Nor by saving it into a notebook of their own.
    const empty = { ...document, title: 'Mine', slots: [{ ...document.slots[0]!, uploadId: null }] };
    const own = await outsider.post('/api/notebooks').send({ workspaceId: outsiderWorkspace, document: empty }).expect(201);
    const saved = await outsider.put(`/api/notebooks/${own.body.notebook.id}`).send({ baseRevision: 1, document });
    expect(saved.status).toBe(404);
    await outsider.get(`/api/uploads/${uploadId}`).expect(404);
    await outsider.get(`/api/uploads/${uploadId}/content`).expect(404);
    // Nor by naming it for one run.
    const run = await outsider.post(`/api/notebooks/${own.body.notebook.id}/runs`).send({ bindings: { reference: uploadId } });
    expect(run.status, run.text).toBe(404);
  });

  it('cannot create a notebook or upload into another workspace', async () => {
    const nb = await outsider.post('/api/notebooks').send({ workspaceId: labWorkspace, document: emptyNotebook('Planted') });
    expect(nb.status).toBe(404);
    const up = await outsider.post('/api/uploads').field('workspaceId', labWorkspace).attach('file', Buffer.from(fitBytes(5, 99)), 'planted.fit');
    expect(up.status).toBe(404);
    const fork = await outsider.post(`/api/shared/${shareToken}/fork`).send({ workspaceId: outsiderWorkspace });
    expect(fork.status).toBe(404);
  });

  it('a lab member keeps binding the lab’s own uploads', async () => {
    const document = { ...emptyNotebook('Second look'), slots: [{ id: 's1', name: 'reference', label: 'Reference', uploadId }] };
    await lab.post('/api/notebooks').send({ workspaceId: labWorkspace, document }).expect(201);
    await lab.put(`/api/notebooks/${notebookId}`).send({ baseRevision: 1, document: { ...document, title: 'Lab secrets, again' } }).expect(200);
  });
});
