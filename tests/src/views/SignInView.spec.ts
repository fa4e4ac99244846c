import { flushPromises, mount } from '@vue/test-utils';
import { createPinia, setActivePinia } from 'pinia';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { createMemoryHistory, createRouter } from 'vue-router';
import { ApiError } from '@/api/http';

vi.mock('@/api/auth', () => ({
  hasSession: vi.fn(),
  signInWithEmail: vi.fn(),
  signUpWithEmail: vi.fn(),
  signOutOfSession: vi.fn(),
}));
vi.mock('@/api/me', () => ({ fetchMe: vi.fn() }));

const auth = await import('@/api/auth');
const { fetchMe } = await import('@/api/me');
const { default: SignInView } = await import('@/views/SignInView.vue');

async function mountSignIn(path = '/sign-in') {
  const pinia = createPinia();
  setActivePinia(pinia);
  const stub = { template: '<div />' };
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/sign-in', name: 'sign-in', component: SignInView },
      { path: '/sign-up', name: 'sign-up', component: stub },
      { path: '/forgot-password', name: 'forgot-password', component: stub },
      { path: '/library', name: 'library', component: stub },
      { path: '/notebooks/:id', name: 'notebook', component: stub },
    ],
  });
  await router.push(path);
  await router.isReady();
  const wrapper = mount(SignInView, { global: { plugins: [pinia, router] }, attachTo: document.body });
  return { wrapper, router };
}

async function fillAndSubmit(wrapper: Awaited<ReturnType<typeof mountSignIn>>['wrapper']): Promise<void> {
  await wrapper.get('input#sign-in-email').setValue('ada@lab.test');
  await wrapper.get('input#sign-in-password').setValue('wrong-pass');
  await wrapper.get('form').trigger('submit');
  await flushPromises();
}

beforeEach(() => {
  vi.mocked(auth.signInWithEmail).mockReset();
  vi.mocked(auth.hasSession).mockReset().mockResolvedValue(true);
  vi.mocked(fetchMe).mockReset();
});

describe('SignInView', () => {
  it('submits the typed e-mail and password and shows the server error', async () => {
    vi.mocked(auth.signInWithEmail).mockRejectedValue(
      new ApiError('account_locked', 'This account is locked for 10 minutes.', 403),
    );
    const { wrapper, router } = await mountSignIn();

    await fillAndSubmit(wrapper);

    expect(auth.signInWithEmail).toHaveBeenCalledWith('ada@lab.test', 'wrong-pass');
    expect(wrapper.get('[role="alert"]').text()).toContain('This account is locked for 10 minutes.');
    expect(router.currentRoute.value.name).toBe('sign-in');
    wrapper.unmount();
  });

  it('words a wrong password plainly', async () => {
    vi.mocked(auth.signInWithEmail).mockRejectedValue(
      new ApiError('invalid_email_or_password', 'Invalid email or password', 401),
    );
    const { wrapper } = await mountSignIn();

    await fillAndSubmit(wrapper);

    expect(wrapper.get('[role="alert"]').text()).toContain('That e-mail and password do not match an account.');
    wrapper.unmount();
  });

  it('goes to the page the visitor asked for after signing in', async () => {
    vi.mocked(auth.signInWithEmail).mockResolvedValue();
    vi.mocked(fetchMe).mockResolvedValue({
      user: { id: 'u1', name: 'Ada', email: 'ada@lab.test', emailVerified: true },
      workspaces: [],
    });
    const { wrapper, router } = await mountSignIn('/sign-in?redirect=/notebooks/nb-7');

    await fillAndSubmit(wrapper);

    expect(router.currentRoute.value.fullPath).toBe('/notebooks/nb-7');
    wrapper.unmount();
  });

  it('says what Cogbook is for and where the demo sign-ins come from', async () => {
    const { wrapper } = await mountSignIn();

    expect(wrapper.text()).toContain('reference power meter');
    expect(wrapper.text()).toContain('npm start');
    expect(wrapper.text()).toContain('analyst@ridgeline.test');
    wrapper.unmount();
  });
});
