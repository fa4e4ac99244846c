import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { emptyNotebook } from '../../shared/notebook/document.js';
import { startServer, type RunningServer } from '../browser/support/server.js';
import { SIGN_UP_PASSWORD, authPost, clientFor, cookieOf, personalWorkspace, signInClient, signUpClient, type Client } from '../stress/support/http-client.js';

/**
 * Accounts and cross-site requests against the built server with NODE_ENV=production:
 * better-auth turns its origin checks and its own rate limit off under NODE_ENV=test
 * (which vitest sets), so only a separate production process shows the real behaviour.
 */
const SIGN_IN_LIMIT = 8;
const EVIL = 'http://evil.example';

let server: RunningServer;
let owner: Client;
let workspaceId: string;

beforeAll(async () => {
  server = await startServer({ DATABASE_URL: '', SEED_DEMO: '0', SIGN_IN_LIMIT: String(SIGN_IN_LIMIT), NODE_ENV: 'production' });
  owner = await signUpClient(server.url, 'owner@lab.test');
  workspaceId = await personalWorkspace(owner);
});
afterAll(async () => server?.stop());

const json = (body: unknown) => ({ headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });

describe('cross-site requests (CSRF)', () => {
  it('refuses state-changing API calls whose Origin is another site, even with a valid session cookie', async () => {
    const evil = clientFor(server.url, owner.cookie, EVIL);
    const attempts = [
      evil.call('/api/notebooks', { method: 'POST', ...json({ workspaceId, document: emptyNotebook('Planted') }) }),
      evil.call(`/api/workspaces/${workspaceId}/members`, { method: 'POST', ...json({ email: 'owner@lab.test', role: 'viewer' }) }),
      evil.call('/api/uploads', { method: 'POST', body: new FormData() }),
      evil.call('/api/notebooks/anything', { method: 'DELETE' }),
    ];
    for (const res of await Promise.all(attempts)) {
      expect(res.status).toBe(403);
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('forbidden_origin');
    }
    // Nothing was created.
    const list = await owner.json<{ notebooks: unknown[] }>('/api/notebooks');
    expect(list.body.notebooks).toHaveLength(0);
  });

  it('refuses a cookie-carrying call without Origin when the browser marks it cross-site', async () => {
    for (const site of ['cross-site', 'same-site']) {
      const res = await fetch(`${server.url}/api/notebooks`, {
        method: 'POST',
        headers: { cookie: owner.cookie, 'sec-fetch-site': site, 'content-type': 'application/json' },
        body: JSON.stringify({ workspaceId, document: emptyNotebook('Planted') }),
      });
      expect(res.status, site).toBe(403);
    }
    // The session cookie is SameSite=Lax and HttpOnly: browsers do not send it on cross-site POSTs at all.
    const signIn = await authPost(server.url, '/api/auth/sign-in/email', { email: 'owner@lab.test', password: SIGN_UP_PASSWORD });
    const sessionCookie = signIn.headers.getSetCookie().find((c) => /session_token=/.test(c))!;
    expect(sessionCookie).toMatch(/HttpOnly/i);
    expect(sessionCookie).toMatch(/SameSite=Lax/i);
  });

  it("refuses better-auth's own state-changing routes from another site (its checks are on in production)", async () => {
    // Without any cookie too: a cross-site sign-up or sign-in would log the visitor into an account the attacker chose.
    const signUp = await authPost(server.url, '/api/auth/sign-up/email', { email: 'planted@lab.test', password: 'planted-password-1', name: 'Planted' }, { origin: EVIL });
    expect(signUp.status).toBe(403);
    const signIn = await authPost(server.url, '/api/auth/sign-in/email', { email: 'owner@lab.test', password: SIGN_UP_PASSWORD }, { origin: EVIL });
    expect(signIn.status).toBe(403);
    expect(signIn.headers.getSetCookie()).toEqual([]);
    const signOut = await fetch(`${server.url}/api/auth/sign-out`, { method: 'POST', headers: { cookie: owner.cookie, origin: EVIL } });
    expect(signOut.status).toBe(403);
    expect((await owner.call('/api/me')).status).toBe(200);
  });
});

describe('sessions', () => {
  it('never keeps a session id planted before sign-in (no fixation)', async () => {
    await signUpClient(server.url, 'fixation@lab.test');
    const planted = 'better-auth.session_token=attacker-chosen-value.c2lnbmF0dXJl';
    const res = await authPost(server.url, '/api/auth/sign-in/email', { email: 'fixation@lab.test', password: SIGN_UP_PASSWORD }, { cookie: planted });
    expect(res.status).toBe(200);
    const issued = cookieOf(res);
    expect(issued).toMatch(/session_token=/);
    expect(issued).not.toContain('attacker-chosen-value');
    expect((await clientFor(server.url, planted).call('/api/me')).status).toBe(401);
    expect((await clientFor(server.url, issued).call('/api/me')).status).toBe(200);
    // A second sign-in gets yet another session.
    const again = await signInClient(server.url, 'fixation@lab.test');
    expect(again.cookie).not.toBe(issued);
  });

  it('revokes the session on the server at sign-out: the old cookie then gets 401', async () => {
    await signUpClient(server.url, 'leaver@lab.test');
    const session = await signInClient(server.url, 'leaver@lab.test');
    const other = await signInClient(server.url, 'leaver@lab.test');
    expect((await session.call('/api/me')).status).toBe(200);
    const out = await session.call('/api/auth/sign-out', { method: 'POST' });
    expect(out.status).toBe(200);
    // Replaying the old cookie (as a thief who copied it would) no longer works anywhere.
    expect((await session.call('/api/me')).status).toBe(401);
    expect((await session.call('/api/notebooks')).status).toBe(401);
    expect((await session.call('/api/notebooks', { method: 'POST', ...json({ workspaceId, document: emptyNotebook('x') }) })).status).toBe(401);
    // Other sessions of the same account are separate.
    expect((await other.call('/api/me')).status).toBe(200);
  });
});

describe('brute force', () => {
  it(`answers 429 once ${SIGN_IN_LIMIT} sign-in attempts came from one address, spoofed X-Forwarded-For or not`, async () => {
    await signUpClient(server.url, 'target@lab.test');
    const attempt = (password: string, forwardedFor?: string) =>
      authPost(server.url, '/api/auth/sign-in/email', { email: 'target@lab.test', password }, forwardedFor ? { 'x-forwarded-for': forwardedFor } : {});
    // Earlier tests in this file used part of the window; the app's limiter says how much is left.
    const statuses: number[] = [];
    let body: { error?: { code: string } } = {};
    for (let i = 0; i <= SIGN_IN_LIMIT && body.error?.code !== 'rate_limited'; i++) {
      const res = await attempt(`wrong-password-${i}`, `198.51.100.${i}`);
      statuses.push(res.status);
      body = (await res.json()) as typeof body;
    }
    expect(statuses.at(-1)).toBe(429);
    expect(body.error?.code).toBe('rate_limited');
    expect(statuses.slice(0, -1).every((s) => s === 401)).toBe(true);
    // Neither a new spoofed address nor the right password gets through now.
    const limited = await attempt(SIGN_UP_PASSWORD, '203.0.113.7');
    expect(limited.status).toBe(429);
    expect(((await limited.json()) as { error: { code: string } }).error.code).toBe('rate_limited');
    expect(limited.headers.get('ratelimit-policy') ?? limited.headers.get('ratelimit')).toBeTruthy();
    expect(limited.headers.getSetCookie()).toEqual([]);
  });
});
