import { beforeAll, describe, expect, it, vi } from 'vitest';
import { createMemoryHistory } from 'vue-router';
import { createAppRouter, RouteName } from '@/router';
import { roleAllows, safeRedirect, type SessionView } from '@/router/guards';

function fakeSession(overrides: Partial<SessionView> = {}): SessionView {
  return {
    signedIn: false,
    isAdminOfCurrent: false,
    isAdminAnywhere: false,
    ensureLoaded: vi.fn(async () => undefined),
    ...overrides,
  };
}

describe('route guard', () => {
  // The routes load their views lazily; the first import of the UI kit is slow under a
  // loaded test runner, so load them once up front instead of inside a timed test.
  beforeAll(async () => {
    await Promise.all([
      import('@/views/SignInView.vue'),
      import('@/views/LibraryView.vue'),
      import('@/views/TeamView.vue'),
      import('@/views/SharedNotebookView.vue'),
    ]);
  }, 60_000);

  it('sends a signed-out visitor of the library to sign-in and keeps where they were going', async () => {
    const router = createAppRouter(fakeSession(), createMemoryHistory());

    await router.push('/library?workspace=w1');

    expect(router.currentRoute.value.name).toBe(RouteName.signIn);
    expect(router.currentRoute.value.query.redirect).toBe('/library?workspace=w1');
  });

  it('sends a signed-out visitor of a notebook link to sign-in with that link', async () => {
    const router = createAppRouter(fakeSession(), createMemoryHistory());

    await router.push('/notebooks/nb-42');

    expect(router.currentRoute.value.name).toBe(RouteName.signIn);
    expect(router.currentRoute.value.query.redirect).toBe('/notebooks/nb-42');
  });

  it('lets signed-out readers open a shared link', async () => {
    const router = createAppRouter(fakeSession(), createMemoryHistory());

    await router.push('/s/abc123');

    expect(router.currentRoute.value.name).toBe(RouteName.shared);
  });

  it('opens a shared link, short or long form, in the shared notebook view', async () => {
    const router = createAppRouter(fakeSession(), createMemoryHistory());

    await router.push('/shared/abc123');

    const route = router.currentRoute.value;
    expect(route.name).toBe(RouteName.shared);
    expect(route.params.token).toBe('abc123');
    // The router swaps a lazy loader for its component once the navigation has loaded it.
    const view: unknown = route.matched[0]!.components!.default;
    const loaded = typeof view === 'function' ? ((await (view as () => Promise<{ default: unknown }>)()).default) : view;
    expect(loaded).toBe((await import('@/views/SharedNotebookView.vue')).default);
  });

  it('sends a signed-in user away from sign-in, to the redirect when it is an app path', async () => {
    const session = fakeSession({ signedIn: true });
    const router = createAppRouter(session, createMemoryHistory());

    await router.push('/sign-in?redirect=/team');
    expect(router.currentRoute.value.name).toBe(RouteName.team);

    await router.push('/sign-in?redirect=//evil.example/x');
    expect(router.currentRoute.value.name).toBe(RouteName.library);
  });

  it('lets a signed-in non-admin reach team (the page shows "not allowed" in place)', async () => {
    const router = createAppRouter(fakeSession({ signedIn: true }), createMemoryHistory());

    await router.push('/team');

    expect(router.currentRoute.value.name).toBe(RouteName.team);
    expect(roleAllows(router.currentRoute.value.meta.access, { isAdminOfCurrent: false, isAdminAnywhere: true })).toBe(false);
    expect(roleAllows(router.currentRoute.value.meta.access, { isAdminOfCurrent: true, isAdminAnywhere: true })).toBe(true);
  });

  it('gates the outbox on being admin of any workspace', () => {
    expect(roleAllows('admin-any', { isAdminOfCurrent: false, isAdminAnywhere: true })).toBe(true);
    expect(roleAllows('admin-any', { isAdminOfCurrent: false, isAdminAnywhere: false })).toBe(false);
  });
});

describe('safeRedirect', () => {
  it('accepts app paths only', () => {
    expect(safeRedirect('/notebooks/1?x=2')).toBe('/notebooks/1?x=2');
    expect(safeRedirect('https://evil.example')).toBeNull();
    expect(safeRedirect('//evil.example')).toBeNull();
    expect(safeRedirect('/\\evil.example')).toBeNull();
    expect(safeRedirect(['/a'])).toBeNull();
  });
});
