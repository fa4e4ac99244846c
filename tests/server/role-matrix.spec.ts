import supertest from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';
import { fitBytes, notebookDoc } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { inviteAndReadToken } from './helpers/invitation-mail.js';
import { DEMO_SAMPLE_FILES } from '../../shared/demo/sample-files.js';

/**
 * Every route against every kind of caller. The lab workspace W has an admin, an
 * analyst and a viewer; "nbviewer" is no member of W but holds a viewer grant on the
 * notebooks; "outsider" belongs only to their own workspace; "anon" has no session.
 * 404 (not 403) whenever the caller cannot even see the thing.
 */
const ROLES = ['admin', 'analyst', 'viewer', 'nbviewer', 'outsider', 'anon'] as const;
type Role = (typeof ROLES)[number];

interface Fixture {
  agents: Record<Role, Agent>;
  ids: Record<Role, string>;
  workspaceId: string;
  notebookId: string;
  uploadId: string;
  mailToViewerId: string;
  runId: string;
  shareToken: string;
  membersOnlyToken: string;
  slug: string;
  /** Each caller's personal workspace (where they are admin); '' for anon. */
  personal: Record<Role, string>;
}

interface RouteCase {
  name: string;
  /** Expected status per role, in ROLES order. */
  expect: [number, number, number, number, number, number];
  run(agent: Agent, fx: Fixture): Promise<supertest.Response>;
}

let t: TestApp;
let fx: Fixture;
let seq = 0;

async function labNotebook(): Promise<string> {
  const res = await fx.agents.admin.post('/api/notebooks').send({ workspaceId: fx.workspaceId, document: notebookDoc({ title: `Disposable ${++seq}` }) });
  const id = res.body.notebook.id as string;
  await fx.agents.admin.put(`/api/notebooks/${id}/access`).send({ grants: [{ email: 'nbviewer@lab.test', role: 'viewer' }] }).expect(200);
  return id;
}

/** A fresh member of W to change or remove. */
async function disposableMember(): Promise<string> {
  const email = `member${++seq}@lab.test`;
  const { userId } = await signUp(t, email);
  await fx.agents.admin.post(`/api/workspaces/${fx.workspaceId}/members`).send({ email, role: 'viewer' }).expect(201);
  return userId;
}

/** The caller's personal workspace (where every signed-in caller is admin). */
const ownWorkspace = (a: Agent, f: Fixture): string => f.personal[ROLES.find((r) => f.agents[r] === a)!] || 'none';

const ok = 200;
const ROUTES: RouteCase[] = [
  { name: 'GET /api/health', expect: [ok, ok, ok, ok, ok, ok], run: (a) => a.get('/api/health') },
  { name: 'GET /api/me', expect: [ok, ok, ok, ok, ok, 401], run: (a) => a.get('/api/me') },
  { name: 'GET /api/workspaces', expect: [ok, ok, ok, ok, ok, 401], run: (a) => a.get('/api/workspaces') },
  { name: 'GET /api/workspaces/:id/members', expect: [ok, ok, ok, 404, 404, 401], run: (a, f) => a.get(`/api/workspaces/${f.workspaceId}/members`) },
  {
    name: 'POST /api/workspaces/:id/members',
    expect: [201, 403, 403, 404, 404, 401],
    run: async (a, f) => {
      const email = `joiner${++seq}@lab.test`;
      await signUp(t, email);
      return a.post(`/api/workspaces/${f.workspaceId}/members`).send({ email, role: 'analyst' });
    },
  },
  {
    name: 'PATCH /api/workspaces/:id/members/:userId',
    expect: [ok, 403, 403, 404, 404, 401],
    run: async (a, f) => a.patch(`/api/workspaces/${f.workspaceId}/members/${await disposableMember()}`).send({ role: 'analyst' }),
  },
  {
    name: 'DELETE /api/workspaces/:id/members/:userId',
    expect: [204, 403, 403, 404, 404, 401],
    run: async (a, f) => a.delete(`/api/workspaces/${f.workspaceId}/members/${await disposableMember()}`),
  },
  // Invitations by e-mail: only W's admins make, list and revoke them; the link itself opens for anyone.
  {
    name: 'POST /api/workspaces/:id/invitations',
    expect: [201, 403, 403, 404, 404, 401],
    run: (a, f) => a.post(`/api/workspaces/${f.workspaceId}/invitations`).send({ email: `invitee${++seq}@lab.test`, role: 'viewer' }),
  },
  { name: 'GET /api/workspaces/:id/invitations', expect: [ok, 403, 403, 404, 404, 401], run: (a, f) => a.get(`/api/workspaces/${f.workspaceId}/invitations`) },
  {
    name: 'DELETE /api/workspaces/:id/invitations/:invitationId',
    expect: [204, 403, 403, 404, 404, 401],
    run: async (a, f) => {
      const made = await fx.agents.admin.post(`/api/workspaces/${f.workspaceId}/invitations`).send({ email: `revoked${++seq}@lab.test`, role: 'viewer' }).expect(201);
      return a.delete(`/api/workspaces/${f.workspaceId}/invitations/${made.body.id}`);
    },
  },
  { name: 'GET /api/invitations/:token', expect: [ok, ok, ok, ok, ok, ok], run: async (a, f) => a.get(`/api/invitations/${await inviteAndReadToken(t, fx.agents.admin, f.workspaceId, `guest${++seq}@lab.test`)}`) },
  {
    // Callers outside W are invited by their own address; W's members (and anon) hold a link for someone else.
    name: 'POST /api/invitations/:token/accept',
    expect: [403, 403, 403, ok, ok, 401],
    run: async (a, f) => {
      const role = ROLES.find((r) => f.agents[r] === a)!;
      const email = role === 'nbviewer' || role === 'outsider' ? `${role}@lab.test` : `stranger${++seq}@lab.test`;
      const res = await a.post(`/api/invitations/${await inviteAndReadToken(t, fx.agents.admin, f.workspaceId, email, 'viewer')}/accept`);
      // Leave W as it was for the routes after this one.
      if (res.status === 200) await fx.agents.admin.delete(`/api/workspaces/${f.workspaceId}/members/${f.ids[role]}`).expect(204);
      return res;
    },
  },
  { name: 'GET /api/notebooks', expect: [ok, ok, ok, ok, ok, 401], run: (a) => a.get('/api/notebooks') },
  {
    name: 'POST /api/notebooks',
    expect: [201, 201, 403, 404, 404, 401],
    run: (a, f) => a.post('/api/notebooks').send({ workspaceId: f.workspaceId, document: notebookDoc() }),
  },
  { name: 'GET /api/notebooks/:id', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/notebooks/${f.notebookId}`) },
  {
    name: 'PUT /api/notebooks/:id',
    expect: [ok, ok, 403, 403, 404, 401],
    run: async (a, f) => {
      const current = await fx.agents.admin.get(`/api/notebooks/${f.notebookId}`);
      return a.put(`/api/notebooks/${f.notebookId}`).send({ baseRevision: current.body.revision, document: current.body.document, summary: 'matrix' });
    },
  },
  { name: 'DELETE /api/notebooks/:id', expect: [204, 403, 403, 403, 404, 401], run: async (a) => a.delete(`/api/notebooks/${await labNotebook()}`) },
  { name: 'GET /api/notebooks/:id/revisions', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/notebooks/${f.notebookId}/revisions`) },
  { name: 'GET /api/notebooks/:id/revisions/:rev', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/notebooks/${f.notebookId}/revisions/1`) },
  {
    name: 'POST /api/notebooks/:id/revisions/:rev/restore',
    expect: [ok, ok, 403, 403, 404, 401],
    run: (a, f) => a.post(`/api/notebooks/${f.notebookId}/revisions/1/restore`).send({}),
  },
  { name: 'GET /api/notebooks/:id/access', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/notebooks/${f.notebookId}/access`) },
  {
    name: 'PUT /api/notebooks/:id/access',
    expect: [ok, 403, 403, 403, 404, 401],
    run: async (a) => a.put(`/api/notebooks/${await labNotebook()}/access`).send({ grants: [{ email: 'nbviewer@lab.test', role: 'editor' }] }),
  },
  {
    name: 'POST /api/uploads',
    expect: [201, 201, 403, 404, 404, 401],
    run: (a, f) => a.post('/api/uploads').field('workspaceId', f.workspaceId).attach('file', Buffer.from(fitBytes(5, 100 + ++seq)), 'ride.fit'),
  },
  // Earlier uploads of W: any member; a notebook grant alone does not open the workspace's files.
  { name: 'GET /api/uploads?workspace=', expect: [ok, ok, ok, 404, 404, 401], run: (a, f) => a.get('/api/uploads').query({ workspace: f.workspaceId }) },
  { name: 'GET /api/samples', expect: [ok, ok, ok, ok, ok, ok], run: (a) => a.get('/api/samples') },
  { name: 'GET /api/samples/:name', expect: [ok, ok, ok, ok, ok, ok], run: (a) => a.get(`/api/samples/${DEMO_SAMPLE_FILES[0]!.fileName}`) },
  { name: 'GET /api/uploads/:id', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/uploads/${f.uploadId}`) },
  { name: 'GET /api/uploads/:id/content', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/uploads/${f.uploadId}/content`) },
  // Everyone signed in administers their own personal workspace, so each may read the outbox (their own mail only).
  { name: 'GET /api/outbox', expect: [ok, ok, ok, ok, ok, 401], run: (a) => a.get('/api/outbox') },
  // The mail to the lab viewer: the lab admin and the viewer themself see it; nobody else.
  { name: 'GET /api/outbox/:id', expect: [ok, 404, ok, 404, 404, 401], run: (a, f) => a.get(`/api/outbox/${f.mailToViewerId}`) },
  // Working together: runs, share links, forks, publishing, export and import.
  { name: 'POST /api/notebooks/:id/runs', expect: [201, 201, 403, 403, 404, 401], run: (a, f) => a.post(`/api/notebooks/${f.notebookId}/runs`).send({ label: 'matrix' }) },
  { name: 'GET /api/notebooks/:id/runs', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/notebooks/${f.notebookId}/runs`) },
  {
    name: 'GET /api/notebooks/:id/runs/compare',
    expect: [ok, ok, ok, ok, 404, 401],
    run: (a, f) => a.get(`/api/notebooks/${f.notebookId}/runs/compare`).query({ path: 'stats.ref_mean' }),
  },
  { name: 'GET /api/runs/:id', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/runs/${f.runId}`) },
  { name: 'GET /api/runs/:id/cells/:cellId.csv', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/runs/${f.runId}/cells/c3.csv`) },
  { name: 'POST /api/notebooks/:id/shares', expect: [201, 201, 403, 403, 404, 401], run: (a, f) => a.post(`/api/notebooks/${f.notebookId}/shares`).send({}) },
  { name: 'GET /api/notebooks/:id/shares', expect: [ok, ok, 403, 403, 404, 401], run: (a, f) => a.get(`/api/notebooks/${f.notebookId}/shares`) },
  {
    name: 'DELETE /api/shares/:token',
    expect: [204, 204, 403, 403, 404, 401],
    run: async (a, f) => a.delete(`/api/shares/${(await fx.agents.admin.post(`/api/notebooks/${f.notebookId}/shares`).send({})).body.token}`),
  },
  { name: 'GET /api/shared/:token', expect: [ok, ok, ok, ok, ok, ok], run: (a, f) => a.get(`/api/shared/${f.shareToken}`) },
  { name: 'GET /api/shared/:token (members only)', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/shared/${f.membersOnlyToken}`) },
  {
    name: 'POST /api/shared/:token/fork (into own workspace)',
    expect: [201, 201, 201, 201, 201, 401],
    run: (a, f) => a.post(`/api/shared/${f.shareToken}/fork`).send({ workspaceId: ownWorkspace(a, f) }),
  },
  {
    name: 'POST /api/notebooks/:id/fork (into own workspace)',
    expect: [201, 201, 201, 201, 404, 401],
    run: (a, f) => a.post(`/api/notebooks/${f.notebookId}/fork`).send({ workspaceId: ownWorkspace(a, f) }),
  },
  {
    name: 'POST /api/notebooks/:id/fork (into the lab)',
    expect: [201, 201, 403, 404, 404, 401],
    run: (a, f) => a.post(`/api/notebooks/${f.notebookId}/fork`).send({ workspaceId: f.workspaceId }),
  },
  {
    name: 'POST /api/notebooks/:id/publication',
    expect: [ok, ok, 403, 403, 404, 401],
    run: (a, f) => a.post(`/api/notebooks/${f.notebookId}/publication`).send({ allowDownloads: true }),
  },
  { name: 'GET /api/notebooks/:id/publication', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/notebooks/${f.notebookId}/publication`) },
  {
    name: 'DELETE /api/notebooks/:id/publication',
    expect: [204, 204, 403, 403, 404, 401],
    run: async (a) => {
      const id = await labNotebook();
      await fx.agents.admin.post(`/api/notebooks/${id}/publication`).send({}).expect(200);
      return a.delete(`/api/notebooks/${id}/publication`);
    },
  },
  { name: 'GET /api/published', expect: [ok, ok, ok, ok, ok, ok], run: (a) => a.get('/api/published') },
  { name: 'GET /api/published/:slug', expect: [ok, ok, ok, ok, ok, ok], run: (a, f) => a.get(`/api/published/${f.slug}`) },
  { name: 'GET /api/published/:slug/files/:uploadId', expect: [ok, ok, ok, ok, ok, ok], run: (a, f) => a.get(`/api/published/${f.slug}/files/${f.uploadId}`) },
  { name: 'GET /api/notebooks/:id/export', expect: [ok, ok, ok, ok, 404, 401], run: (a, f) => a.get(`/api/notebooks/${f.notebookId}/export?recordings=1`) },
  {
    name: 'POST /api/notebooks/import',
    expect: [201, 201, 403, 404, 404, 401],
    run: async (a, f) => {
      const file = (await fx.agents.admin.get(`/api/notebooks/${f.notebookId}/export?recordings=1`).expect(200)).body;
      return a.post('/api/notebooks/import').send({ workspaceId: f.workspaceId, file });
    },
  },
  { name: 'GET /api/unknown', expect: [404, 404, 404, 404, 404, 404], run: (a) => a.get('/api/unknown') },
];

beforeAll(async () => {
  t = await createTestApp();
  const made = {} as Record<Role, { agent: Agent; userId: string }>;
  for (const role of ROLES.filter((r) => r !== 'anon')) made[role] = await signUp(t, `${role}@lab.test`, role);
  const agents = Object.fromEntries(ROLES.map((r) => [r, r === 'anon' ? supertest.agent(t.app) : made[r].agent])) as Record<Role, Agent>;
  const ids = Object.fromEntries(ROLES.map((r) => [r, r === 'anon' ? '' : made[r].userId])) as Record<Role, string>;
  // The lab is the admin's personal workspace (any workspace works the same).
  const workspaceId = await personalWorkspaceOf(agents.admin);
  await agents.admin.post(`/api/workspaces/${workspaceId}/members`).send({ email: 'analyst@lab.test', role: 'analyst' }).expect(201);
  await agents.admin.post(`/api/workspaces/${workspaceId}/members`).send({ email: 'viewer@lab.test', role: 'viewer' }).expect(201);
  const up = await agents.admin.post('/api/uploads').field('workspaceId', workspaceId).attach('file', Buffer.from(fitBytes()), 'reference.fit').expect(201);
  const uploadId = up.body.uploads[0].id as string;
  // A recipe notebook (slots, a table, a formula, a chart), so runs, CSV and publishing have something to compute.
  const nb = await agents.admin.post('/api/notebooks').send({ workspaceId, document: recipeDoc({ reference: uploadId, test: null }) }).expect(201);
  const notebookId = nb.body.notebook.id as string;
  await agents.admin.put(`/api/notebooks/${notebookId}/access`).send({ grants: [{ email: 'nbviewer@lab.test', role: 'viewer' }] }).expect(200);
  await supertest(t.app).post('/api/auth/request-password-reset').send({ email: 'viewer@lab.test', redirectTo: '/reset-password' }).expect(200);
  let mailToViewerId = '';
  for (let i = 0; i < 50 && !mailToViewerId; i++) {
    const list = await agents.viewer.get('/api/outbox');
    mailToViewerId = list.body.messages?.[0]?.id ?? '';
    if (!mailToViewerId) await new Promise((r) => setTimeout(r, 50));
  }
  expect(mailToViewerId).not.toBe('');
  const runId = (await agents.admin.post(`/api/notebooks/${notebookId}/runs`).send({}).expect(201)).body.id as string;
  const shareToken = (await agents.admin.post(`/api/notebooks/${notebookId}/shares`).send({}).expect(201)).body.token as string;
  const membersOnlyToken = (await agents.admin.post(`/api/notebooks/${notebookId}/shares`).send({ membersOnly: true }).expect(201)).body.token as string;
  const slug = (await agents.admin.post(`/api/notebooks/${notebookId}/publication`).send({ allowDownloads: true }).expect(200)).body.slug as string;
  const personal = {} as Record<Role, string>;
  for (const role of ROLES) {
    // The lab is the admin's personal workspace too: pick the one each caller administers.
    const list = role === 'anon' ? [] : ((await agents[role].get('/api/workspaces')).body.workspaces as { id: string; personal: boolean; role: string }[]);
    personal[role] = list.find((w) => w.personal && w.role === 'admin')?.id ?? '';
  }
  fx = { agents, ids, workspaceId, notebookId, uploadId, mailToViewerId, runId, shareToken, membersOnlyToken, slug, personal };
});
afterAll(async () => t.close());

describe('role matrix', () => {
  for (const route of ROUTES) {
    it(`${route.name}: ${ROLES.map((r, i) => `${r} ${route.expect[i]}`).join(', ')}`, async () => {
      const got: Record<string, number> = {};
      const want: Record<string, number> = {};
      for (const [i, role] of ROLES.entries()) {
        const res = await route.run(fx.agents[role], fx);
        got[role] = res.status;
        want[role] = route.expect[i]!;
        if (res.status >= 400) {
          // Every refusal has the one error shape.
          expect(res.body.error, `${route.name} as ${role}`).toMatchObject({ code: expect.any(String), message: expect.any(String) });
        }
      }
      expect(got).toEqual(want);
    });
  }
});
