import { createPinia, setActivePinia } from 'pinia';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { MeResponse } from '../../../shared/api/me.js';
import { ApiError } from '@/api/http';

vi.mock('@/api/me', () => ({ fetchMe: vi.fn() }));
vi.mock('@/api/auth', () => ({
  hasSession: vi.fn(),
  signInWithEmail: vi.fn(),
  signUpWithEmail: vi.fn(),
  signOutOfSession: vi.fn(),
}));

const { fetchMe } = await import('@/api/me');
const auth = await import('@/api/auth');
const { useSessionStore } = await import('@/stores/session');

function me(overrides: Partial<MeResponse> = {}): MeResponse {
  return {
    user: { id: 'u1', name: 'Ada Tester', email: 'ada@lab.test', emailVerified: true },
    workspaces: [
      { id: 'w1', name: 'Personal', role: 'admin', personal: true, createdAt: '2026-01-01T00:00:00Z' },
      { id: 'w2', name: 'Hill Lab', role: 'viewer', personal: false, createdAt: '2026-01-02T00:00:00Z' },
    ],
    ...overrides,
  };
}

beforeEach(() => {
  setActivePinia(createPinia());
  localStorage.clear();
  vi.mocked(fetchMe).mockReset();
  vi.mocked(auth.signInWithEmail).mockReset();
  vi.mocked(auth.hasSession).mockReset().mockResolvedValue(true);
  vi.mocked(auth.signOutOfSession).mockReset();
});

describe('useSessionStore', () => {
  it('does not ask /api/me when the browser has no session', async () => {
    vi.mocked(auth.hasSession).mockResolvedValue(false);
    const session = useSessionStore();

    await session.ensureLoaded();

    expect(session.signedIn).toBe(false);
    expect(fetchMe).not.toHaveBeenCalled();
  });

  it('treats a 401 from /api/me (session ended meanwhile) as signed out, not as a failure', async () => {
    vi.mocked(fetchMe).mockRejectedValue(new ApiError('unauthenticated', 'Sign in first.', 401));
    const session = useSessionStore();

    await session.ensureLoaded();

    expect(session.loaded).toBe(true);
    expect(session.signedIn).toBe(false);
    expect(session.currentWorkspace).toBeNull();
  });

  it('loads once even when asked twice at the same time', async () => {
    vi.mocked(fetchMe).mockResolvedValue(me());
    const session = useSessionStore();

    await Promise.all([session.ensureLoaded(), session.ensureLoaded()]);
    await session.ensureLoaded();

    expect(fetchMe).toHaveBeenCalledTimes(1);
  });

  it('signs in, then knows the user, the first workspace and the role there', async () => {
    vi.mocked(auth.signInWithEmail).mockResolvedValue();
    vi.mocked(fetchMe).mockResolvedValue(me());
    const session = useSessionStore();

    await session.signIn('ada@lab.test', 'secret-pass');

    expect(auth.signInWithEmail).toHaveBeenCalledWith('ada@lab.test', 'secret-pass');
    expect(session.user?.name).toBe('Ada Tester');
    session.selectWorkspace('w1');
    expect(session.currentWorkspace?.id).toBe('w1');
    expect(session.isAdminOfCurrent).toBe(true);
    expect(session.canCreateNotebooks).toBe(true);
  });

  it('gives a viewer workspace no admin or create rights but keeps admin-anywhere', async () => {
    vi.mocked(fetchMe).mockResolvedValue(me());
    const session = useSessionStore();
    await session.refresh();

    session.selectWorkspace('w2');

    expect(session.currentRole).toBe('viewer');
    expect(session.isAdminOfCurrent).toBe(false);
    expect(session.canCreateNotebooks).toBe(false);
    expect(session.isAdminAnywhere).toBe(true);
    expect(session.roleIn('w1')).toBe('admin');
  });

  it('starts in a shared workspace when none was chosen before', async () => {
    vi.mocked(fetchMe).mockResolvedValue(me());
    const session = useSessionStore();

    await session.refresh();

    expect(session.currentWorkspace?.name).toBe('Hill Lab');
  });

  it('remembers the chosen workspace for the next load and ignores unknown ids', async () => {
    vi.mocked(fetchMe).mockResolvedValue(me());
    const first = useSessionStore();
    await first.refresh();
    first.selectWorkspace('w1');
    first.selectWorkspace('nope');

    setActivePinia(createPinia());
    const second = useSessionStore();
    await second.refresh();

    expect(second.currentWorkspace?.id).toBe('w1');
  });

  it('passes a sign-in error through and stays signed out', async () => {
    vi.mocked(auth.signInWithEmail).mockRejectedValue(new ApiError('invalid_email_or_password', 'Invalid', 401));
    const session = useSessionStore();

    await expect(session.signIn('a@b.test', 'x')).rejects.toMatchObject({ code: 'invalid_email_or_password' });
    expect(session.signedIn).toBe(false);
    expect(fetchMe).not.toHaveBeenCalled();
  });

  it('forgets the user on sign-out even if the server call fails', async () => {
    vi.mocked(fetchMe).mockResolvedValue(me());
    vi.mocked(auth.signOutOfSession).mockRejectedValue(new ApiError('network', 'offline', 0));
    const session = useSessionStore();
    await session.refresh();

    await expect(session.signOut()).rejects.toBeInstanceOf(ApiError);

    expect(session.signedIn).toBe(false);
    expect(session.workspaces).toEqual([]);
  });
});
