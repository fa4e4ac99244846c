import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { InvitationPreview } from '../../../../shared/api/invitations.js';
import type { MeResponse } from '../../../../shared/api/me.js';
import { useSessionStore } from '@/stores/session';
import { buttonNamed, click, fakeServer, LAB, mountTeam, NOW, toasts } from './support';

// The page an invitation mail links to, in each of its states: a link that works (signed
// out, signed in with the invited address, signed in as someone else) and one that does not.

vi.mock('@/api/auth', () => ({
  hasSession: vi.fn(),
  signInWithEmail: vi.fn(),
  signUpWithEmail: vi.fn(),
  signOutOfSession: vi.fn(),
}));

const auth = await import('@/api/auth');
const { default: InvitationView } = await import('@/views/InvitationView.vue');

const TOKEN = 'T'.repeat(43);
const PREVIEW: InvitationPreview = { workspaceName: 'Hill Lab', inviterName: 'Ada Admin', role: 'analyst', email: 'juno@hill.test', expiresAt: '2026-03-08T10:00:00.000Z' };
const JUNO = { id: 'u7', name: 'Juno', email: 'juno@hill.test', emailVerified: true };
const PERSONAL = { id: 'ws7', name: 'Juno', role: 'admin' as const, personal: true, createdAt: NOW };
const me = (user: MeResponse['user'], workspaces: MeResponse['workspaces']): MeResponse => ({ user, workspaces });

beforeEach(() => {
  vi.mocked(auth.hasSession).mockReset().mockResolvedValue(false);
  vi.mocked(auth.signOutOfSession).mockReset().mockResolvedValue();
});

afterEach(() => {
  vi.unstubAllGlobals();
  document.body.innerHTML = '';
});

const open = () => mountTeam(InvitationView, { props: { token: TOKEN }, path: `/invitations/${TOKEN}` });

describe('InvitationView', () => {
  it('signed out: says who invited which address to what, and offers to sign up or sign in and come back', async () => {
    fakeServer({ [`GET /api/invitations/${TOKEN}`]: { body: PREVIEW } });
    await open();

    expect(document.querySelector('h1')?.textContent).toBe('Invitation to Cogbook');
    expect(document.querySelector('.invitation__offer')?.textContent?.replace(/\s+/g, ' ').trim()).toBe(
      'Ada Admin invited juno@hill.test to the workspace Hill Lab as Analyst (creates and edits notebooks).',
    );
    expect(document.body.textContent).toContain('The link works until');
    const links = [...document.querySelectorAll<HTMLAnchorElement>('.invitation__actions a')].map((a) => [a.textContent?.trim(), a.getAttribute('href')]);
    const back = encodeURIComponent(`/invitations/${TOKEN}`).replace(/%2F/g, '/');
    expect(links).toEqual([
      ['Create an account', `/sign-up?redirect=${back}`],
      ['Sign in', `/sign-in?redirect=${back}`],
    ]);
    expect(document.body.querySelector('button')).toBeNull();
  });

  it('an unknown, used, revoked or expired link (404) says it does not work and how to get a new one', async () => {
    fakeServer({ [`GET /api/invitations/${TOKEN}`]: { status: 404, body: { error: { code: 'not_found', message: 'Invitation not found.' } } } });
    await open();

    const alert = document.querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('This invitation link does not work (any more).');
    expect(alert?.textContent).toContain('Ask an admin of the workspace to invite you again.');
    expect(document.querySelector('.invitation')).toBeNull();
    expect(document.querySelectorAll('.invitation__actions a')).toHaveLength(0);
  });

  it('a link that is not even a token (400) reads the same as an unknown one', async () => {
    fakeServer({ [`GET /api/invitations/${TOKEN}`]: { status: 400, body: { error: { code: 'invalid_request', message: 'token: not an invitation token' } } } });
    await open();
    expect(document.querySelector('[role="alert"]')?.textContent).toContain('This invitation link does not work (any more).');
  });

  it('any other failure is shown as it is, not as a dead link', async () => {
    fakeServer({ [`GET /api/invitations/${TOKEN}`]: { status: 503, body: { error: { code: 'unavailable', message: 'The database is not answering.' } } } });
    await open();
    const alert = document.querySelector('[role="alert"]');
    expect(alert?.textContent).toContain('The database is not answering.');
    expect(alert?.textContent).not.toContain('does not work');
  });

  it('signed in with the invited address: one button joins, then the library opens in that workspace', async () => {
    vi.mocked(auth.hasSession).mockResolvedValue(true);
    let joined = false;
    const seen = fakeServer({
      [`GET /api/invitations/${TOKEN}`]: { body: PREVIEW },
      'GET /api/me': () => ({ body: me(JUNO, joined ? [PERSONAL, { ...LAB, role: 'analyst' }] : [PERSONAL]) }),
      [`POST /api/invitations/${TOKEN}/accept`]: () => {
        joined = true;
        return { body: { workspaceId: LAB.id, workspaceName: 'Hill Lab', role: 'analyst' } };
      },
    });
    const { router } = await open();

    expect(document.querySelectorAll('.invitation__actions a')).toHaveLength(0);
    await click(buttonNamed('Join Hill Lab'));

    expect(seen.filter((r) => r.method === 'POST').map((r) => r.path)).toEqual([`/api/invitations/${TOKEN}/accept`]);
    expect(router.currentRoute.value.name).toBe('library');
    expect(useSessionStore().currentWorkspace?.id).toBe(LAB.id);
    expect(toasts()).toContain('You joined Hill Lab as analyst.');
  });

  it('signed in with the invited address: a refused join says why and stays on the page', async () => {
    vi.mocked(auth.hasSession).mockResolvedValue(true);
    fakeServer({
      [`GET /api/invitations/${TOKEN}`]: { body: PREVIEW },
      'GET /api/me': { body: me(JUNO, [PERSONAL]) },
      [`POST /api/invitations/${TOKEN}/accept`]: { status: 404, body: { error: { code: 'not_found', message: 'This invitation was revoked a moment ago.' } } },
    });
    const { router } = await open();

    await click(buttonNamed('Join Hill Lab'));

    expect(document.querySelector('[role="alert"]')?.textContent).toContain('This invitation was revoked a moment ago.');
    expect(router.currentRoute.value.path).toBe(`/invitations/${TOKEN}`);
    expect(buttonNamed('Join Hill Lab').disabled).toBe(false);
  });

  it('the invited address matches whatever its case', async () => {
    vi.mocked(auth.hasSession).mockResolvedValue(true);
    fakeServer({ [`GET /api/invitations/${TOKEN}`]: { body: { ...PREVIEW, email: 'Juno@Hill.test' } }, 'GET /api/me': { body: me(JUNO, [PERSONAL]) } });
    await open();
    expect(buttonNamed('Join Hill Lab')).toBeTruthy();
  });

  it('signed in as someone else: says whose invitation it is, offers only to sign out, then shows the signed-out choices', async () => {
    vi.mocked(auth.hasSession).mockResolvedValue(true);
    const seen = fakeServer({
      [`GET /api/invitations/${TOKEN}`]: { body: PREVIEW },
      'GET /api/me': { body: me({ id: 'u1', name: 'Ada Admin', email: 'ada@hill.test', emailVerified: true }, [LAB]) },
    });
    await open();

    const warning = document.querySelector('.invitation [role="alert"]')?.textContent ?? '';
    expect(warning).toContain('You are signed in as ada@hill.test.');
    expect(warning).toContain('This invitation is for juno@hill.test. Sign out, then sign in or sign up as juno@hill.test to accept it.');
    expect(() => buttonNamed('Join Hill Lab')).toThrow();

    await click(buttonNamed('Sign out'));

    expect(auth.signOutOfSession).toHaveBeenCalledOnce();
    expect(seen.some((r) => r.method === 'POST')).toBe(false);
    expect([...document.querySelectorAll('.invitation__actions a')].map((a) => a.textContent?.trim())).toEqual(['Create an account', 'Sign in']);
  });
});
