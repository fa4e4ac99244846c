import { createHash } from 'node:crypto';
import { eq, sql } from 'drizzle-orm';
import supertest from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { workspaceInvitation } from '../../server/db/schema.js';
import { notebookDoc } from './helpers/fixtures.js';
import { invitationTokenFor, inviteAndReadToken } from './helpers/invitation-mail.js';
import { createTestApp, personalWorkspaceOf, signUp, TEST_PASSWORD, type Agent, type TestApp } from './helpers/test-app.js';

let t: TestApp;
let admin: Agent;
let analyst: Agent;
let viewer: Agent;
let outsider: Agent;
let anon: Agent;
let lab: string;

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  admin = (await signUp(t, 'head@lab.test', 'Hana Head')).agent;
  analyst = (await signUp(t, 'analyst@lab.test')).agent;
  viewer = (await signUp(t, 'viewer@lab.test')).agent;
  outsider = (await signUp(t, 'outsider@elsewhere.test')).agent;
  anon = supertest.agent(t.app);
  lab = await personalWorkspaceOf(admin);
  await admin.post(`/api/workspaces/${lab}/members`).send({ email: 'analyst@lab.test', role: 'analyst' }).expect(201);
  await admin.post(`/api/workspaces/${lab}/members`).send({ email: 'viewer@lab.test', role: 'viewer' }).expect(201);
});

const expire = (email: string) =>
  t.database.db.update(workspaceInvitation).set({ expiresAt: sql`now() - interval '1 minute'` }).where(eq(workspaceInvitation.email, email));

describe('inviting by e-mail', () => {
  it('mails an accept link on the public origin and keeps only the hash of its token', async () => {
    const res = await admin.post(`/api/workspaces/${lab}/invitations`).send({ email: 'New.Rider@Lab.test', role: 'analyst' }).expect(201);
    expect(res.body).toMatchObject({ email: 'new.rider@lab.test', role: 'analyst', invitedBy: { name: 'Hana Head' } });
    expect(res.body).not.toHaveProperty('token');
    // Seven days, give or take the request's own duration.
    const days = (Date.parse(res.body.expiresAt) - Date.parse(res.body.createdAt)) / 86_400_000;
    expect(days).toBeCloseTo(7, 3);

    const mail = await invitationTokenFor(t, 'new.rider@lab.test');
    expect(mail.url).toBe(`http://localhost:3000/invitations/${mail.token}`);
    expect(mail.subject).toContain('Hana Head');
    expect(mail.text).toContain('as an analyst');
    const [row] = await t.database.db.select().from(workspaceInvitation);
    expect(row!.tokenHash).toBe(createHash('sha256').update(mail.token).digest('hex'));
    expect(JSON.stringify(row)).not.toContain(mail.token);
    // The local outbox shows the inviting workspace's admins the mail (the address is no member yet), nobody else.
    const inOutbox = async (agent: Agent) => ((await agent.get('/api/outbox').expect(200)).body.messages as { to: string }[]).map((m) => m.to);
    expect(await inOutbox(admin)).toContain('new.rider@lab.test');
    expect(await inOutbox(outsider)).not.toContain('new.rider@lab.test');
  });

  it('shows the link to anyone holding it: workspace, inviter, role; never cached', async () => {
    const token = await inviteAndReadToken(t, admin, lab, 'guest@lab.test', 'viewer');
    const res = await anon.get(`/api/invitations/${token}`).expect(200);
    expect(res.body).toMatchObject({ workspaceName: "Hana Head's notebooks", inviterName: 'Hana Head', role: 'viewer', email: 'guest@lab.test' });
    expect(res.headers['cache-control']).toBe('no-store');
    expect(res.headers['referrer-policy']).toBe('no-referrer');
  });

  it('joins the invited account once, with the invited role', async () => {
    const token = await inviteAndReadToken(t, admin, lab, 'newcomer@lab.test', 'analyst');
    await anon.post(`/api/invitations/${token}/accept`).expect(401);
    // Addresses are compared without case: better-auth stores them lower-cased.
    const { agent: newcomer, userId } = await signUp(t, 'NewComer@lab.test');
    const res = await newcomer.post(`/api/invitations/${token}/accept`).expect(200);
    expect(res.body).toEqual({ workspaceId: lab, workspaceName: "Hana Head's notebooks", role: 'analyst' });
    const members = (await admin.get(`/api/workspaces/${lab}/members`).expect(200)).body.members as { user: { id: string }; role: string }[];
    expect(members.filter((m) => m.user.id === userId)).toEqual([expect.objectContaining({ role: 'analyst' })]);
    // Used up: the link neither opens nor accepts again, and it leaves the pending list.
    await anon.get(`/api/invitations/${token}`).expect(404);
    const again = await newcomer.post(`/api/invitations/${token}/accept`).expect(404);
    expect(again.body.error.message).toMatch(/already used/);
    expect((await admin.get(`/api/workspaces/${lab}/invitations`).expect(200)).body.invitations).toEqual([]);
    // The new member can create in the lab at once.
    await newcomer.post('/api/notebooks').send({ workspaceId: lab, document: notebookDoc() }).expect(201);
  });

  it('refuses an account with another address with 403 and says which address to use', async () => {
    const token = await inviteAndReadToken(t, admin, lab, 'invitee@lab.test');
    const res = await outsider.post(`/api/invitations/${token}/accept`).expect(403);
    expect(res.body.error.code).toBe('email_mismatch');
    expect(res.body.error.message).toContain('invitee@lab.test');
    expect(res.body.error.message).toContain('outsider@elsewhere.test');
    // The link still works for the right person.
    const { agent } = await signUp(t, 'invitee@lab.test');
    await agent.post(`/api/invitations/${token}/accept`).expect(200);
  });

  it('lets an expired link neither open nor accept, nor be listed or revoked', async () => {
    const token = await inviteAndReadToken(t, admin, lab, 'late@lab.test');
    const { id } = (await admin.get(`/api/workspaces/${lab}/invitations`).expect(200)).body.invitations[0];
    await expire('late@lab.test');
    const { agent } = await signUp(t, 'late@lab.test');
    await anon.get(`/api/invitations/${token}`).expect(404);
    await agent.post(`/api/invitations/${token}/accept`).expect(404);
    expect((await admin.get(`/api/workspaces/${lab}/invitations`).expect(200)).body.invitations).toEqual([]);
    await admin.delete(`/api/workspaces/${lab}/invitations/${id}`).expect(404);
    expect((await agent.get('/api/workspaces').expect(200)).body.workspaces.map((w: { id: string }) => w.id)).not.toContain(lab);
  });

  it('revoking ends the link at once', async () => {
    const token = await inviteAndReadToken(t, admin, lab, 'revoked@lab.test');
    const list = (await admin.get(`/api/workspaces/${lab}/invitations`).expect(200)).body.invitations;
    expect(list).toEqual([expect.objectContaining({ email: 'revoked@lab.test', role: 'analyst' })]);
    await admin.delete(`/api/workspaces/${lab}/invitations/${list[0].id}`).expect(204);
    await anon.get(`/api/invitations/${token}`).expect(404);
    const { agent } = await signUp(t, 'revoked@lab.test');
    await agent.post(`/api/invitations/${token}/accept`).expect(404);
    await admin.delete(`/api/workspaces/${lab}/invitations/${list[0].id}`).expect(404);
  });

  it('a new invitation to the same address replaces the old link', async () => {
    const first = await inviteAndReadToken(t, admin, lab, 'twice@lab.test', 'viewer');
    const second = await inviteAndReadToken(t, admin, lab, 'twice@lab.test', 'analyst');
    expect(second).not.toBe(first);
    await anon.get(`/api/invitations/${first}`).expect(404);
    expect((await anon.get(`/api/invitations/${second}`).expect(200)).body.role).toBe('analyst');
    expect((await admin.get(`/api/workspaces/${lab}/invitations`).expect(200)).body.invitations).toHaveLength(1);
  });

  it('answers 409 for an address that is already a member, 400 for a bad address or role', async () => {
    const res = await admin.post(`/api/workspaces/${lab}/invitations`).send({ email: 'VIEWER@lab.test', role: 'analyst' }).expect(409);
    expect(res.body.error.code).toBe('already_member');
    await admin.post(`/api/workspaces/${lab}/invitations`).send({ email: 'not-an-address', role: 'analyst' }).expect(400);
    await admin.post(`/api/workspaces/${lab}/invitations`).send({ email: 'a@lab.test', role: 'owner' }).expect(400);
    await anon.get('/api/invitations/short').expect(400);
  });

  it('an unknown token answers 404 to everyone', async () => {
    const unknown = 'x'.repeat(43);
    await anon.get(`/api/invitations/${unknown}`).expect(404);
    await outsider.post(`/api/invitations/${unknown}/accept`).expect(404);
  });

  it('an invitee who already joined keeps their role; the link is used up', async () => {
    const token = await inviteAndReadToken(t, admin, lab, 'early@lab.test', 'admin');
    await signUp(t, 'early@lab.test');
    await admin.post(`/api/workspaces/${lab}/members`).send({ email: 'early@lab.test', role: 'viewer' }).expect(201);
    const { agent } = await signInAs('early@lab.test');
    expect((await agent.post(`/api/invitations/${token}/accept`).expect(200)).body.role).toBe('viewer');
    await anon.get(`/api/invitations/${token}`).expect(404);
  });

  it('removing a member who joined by invitation ends their access at once', async () => {
    const token = await inviteAndReadToken(t, admin, lab, 'brief@lab.test', 'analyst');
    const { agent, userId } = await signUp(t, 'brief@lab.test');
    await agent.post(`/api/invitations/${token}/accept`).expect(200);
    await agent.get(`/api/workspaces/${lab}/members`).expect(200);
    await admin.delete(`/api/workspaces/${lab}/members/${userId}`).expect(204);
    await agent.get(`/api/workspaces/${lab}/members`).expect(404);
  });
});

describe('who may manage invitations', () => {
  // In order: admin, analyst, viewer, member of another workspace only, signed out.
  const callers = () => ({ admin, analyst, viewer, outsider, anon });

  it('POST /api/workspaces/:id/invitations: admin 201, analyst 403, viewer 403, outsider 404, signed out 401', async () => {
    const got: Record<string, number> = {};
    for (const [name, agent] of Object.entries(callers())) {
      got[name] = (await agent.post(`/api/workspaces/${lab}/invitations`).send({ email: `by-${name}@lab.test`, role: 'viewer' })).status;
    }
    expect(got).toEqual({ admin: 201, analyst: 403, viewer: 403, outsider: 404, anon: 401 });
  });

  it('GET /api/workspaces/:id/invitations: admin 200, analyst 403, viewer 403, outsider 404, signed out 401', async () => {
    await inviteAndReadToken(t, admin, lab, 'listed@lab.test');
    const got: Record<string, number> = {};
    for (const [name, agent] of Object.entries(callers())) got[name] = (await agent.get(`/api/workspaces/${lab}/invitations`)).status;
    expect(got).toEqual({ admin: 200, analyst: 403, viewer: 403, outsider: 404, anon: 401 });
  });

  it('DELETE /api/workspaces/:id/invitations/:invitationId: only the admin revokes', async () => {
    const got: Record<string, number> = {};
    for (const [name, agent] of Object.entries(callers()).reverse()) {
      const created = await admin.post(`/api/workspaces/${lab}/invitations`).send({ email: `rev-${name}@lab.test`, role: 'viewer' }).expect(201);
      got[name] = (await agent.delete(`/api/workspaces/${lab}/invitations/${created.body.id}`)).status;
    }
    expect(got).toEqual({ admin: 204, analyst: 403, viewer: 403, outsider: 404, anon: 401 });
  });

  it("an invitation id of another workspace cannot be revoked through one's own", async () => {
    const created = await admin.post(`/api/workspaces/${lab}/invitations`).send({ email: 'cross@lab.test', role: 'viewer' }).expect(201);
    const own = await personalWorkspaceOf(outsider);
    await outsider.delete(`/api/workspaces/${own}/invitations/${created.body.id}`).expect(404);
    expect((await admin.get(`/api/workspaces/${lab}/invitations`)).body.invitations).toHaveLength(1);
  });

  it('GET /api/invitations/:token opens for everyone; accept needs the invited account', async () => {
    const token = await inviteAndReadToken(t, admin, lab, 'outsider@elsewhere.test', 'viewer');
    const seen: Record<string, number> = {};
    for (const [name, agent] of Object.entries(callers())) seen[name] = (await agent.get(`/api/invitations/${token}`)).status;
    expect(seen).toEqual({ admin: 200, analyst: 200, viewer: 200, outsider: 200, anon: 200 });
    const accepted: Record<string, number> = {};
    for (const [name, agent] of Object.entries(callers())) accepted[name] = (await agent.post(`/api/invitations/${token}/accept`)).status;
    expect(accepted).toEqual({ admin: 403, analyst: 403, viewer: 403, outsider: 200, anon: 401 });
  });
});

async function signInAs(email: string): Promise<{ agent: Agent }> {
  const agent = supertest.agent(t.app);
  await agent.post('/api/auth/sign-in/email').send({ email, password: TEST_PASSWORD }).expect(200);
  return { agent };
}
