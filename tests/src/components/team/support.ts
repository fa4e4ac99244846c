import { QueryClient, VueQueryPlugin } from '@tanstack/vue-query';
import { flushPromises, mount } from '@vue/test-utils';
import { App as AntApp } from 'ant-design-vue';
import { createPinia, setActivePinia } from 'pinia';
import { defineComponent, h, type Component } from 'vue';
import { createMemoryHistory, createRouter } from 'vue-router';
import type { PendingInvitation } from '../../../../shared/api/invitations.js';
import type { WorkspaceMember, WorkspaceSummary } from '../../../../shared/api/workspaces.js';
import { useSessionStore, type SessionUser } from '@/stores/session';
import { click, NOW } from '../collab/support';

export { buttonNamed, click, fakeServer, NOW } from '../collab/support';

export const LAB: WorkspaceSummary = { id: 'ws1', name: 'Hill Lab', role: 'admin', personal: false, createdAt: NOW };

export function member(id: string, name: string, role: WorkspaceMember['role']): WorkspaceMember {
  return { user: { id, name, email: `${name.split(' ')[0]!.toLowerCase()}@hill.test` }, role, addedAt: NOW };
}

export function pending(id: string, email: string, role: PendingInvitation['role'] = 'analyst'): PendingInvitation {
  return { id, email, role, invitedBy: { id: 'u1', name: 'Ada Admin' }, createdAt: NOW, expiresAt: '2026-03-08T10:00:00.000Z' };
}

/**
 * Mounts a team page part inside ant's App (the toasts need it) with a fresh query cache,
 * Pinia and a memory router knowing the routes these pages link to. `path` is where the
 * router starts (the invitation page reads its token from its props, not the route).
 * `signedInAs` fills the session as if the server had answered who is signed in.
 */
export async function mountTeam(component: Component, options: { props?: Record<string, unknown>; path?: string; signedInAs?: SessionUser; workspaces?: WorkspaceSummary[] } = {}) {
  const pinia = createPinia();
  setActivePinia(pinia);
  if (options.signedInAs) {
    const session = useSessionStore();
    session.user = options.signedInAs;
    session.workspaces = options.workspaces ?? [LAB];
    session.loaded = true;
  }
  const stub = { template: '<div />' };
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: stub },
      { path: '/library', name: 'library', component: stub },
      { path: '/team', name: 'team', component: stub },
      { path: '/sign-in', name: 'sign-in', component: stub },
      { path: '/sign-up', name: 'sign-up', component: stub },
      { path: '/invitations/:token', name: 'invitation', component: stub },
    ],
  });
  await router.push(options.path ?? '/');
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  const Host = defineComponent({ render: () => h(AntApp, null, { default: () => h(component, options.props ?? {}) }) });
  const wrapper = mount(Host, { attachTo: document.body, global: { plugins: [pinia, router, [VueQueryPlugin, { queryClient }]] } });
  await flushPromises();
  return { wrapper, router, pinia, queryClient };
}

/** Opens an ant Select (by the id of its input) and picks the option with this text. */
export async function choose(selectId: string, optionText: string): Promise<void> {
  const input = document.getElementById(selectId);
  if (!input) throw new Error(`no select #${selectId}`);
  const selector = input.closest('.ant-select')!.querySelector('.ant-select-selector')!;
  selector.dispatchEvent(new MouseEvent('mousedown', { bubbles: true }));
  await flushPromises();
  await new Promise((r) => setTimeout(r, 0));
  const listId = `${selectId}_list`;
  const options = [...document.body.querySelectorAll<HTMLElement>('.ant-select-dropdown:not(.ant-select-dropdown-hidden) .ant-select-item-option')];
  const option = options.find((o) => o.textContent?.trim() === optionText);
  if (!option) throw new Error(`no option “${optionText}” for #${selectId} (${listId}) in: ${options.map((o) => o.textContent?.trim()).join(' | ')}`);
  await click(option);
}

/** The text of every toast shown so far. */
export function toasts(): string[] {
  return [...document.body.querySelectorAll('.ant-message-notice')].map((n) => n.textContent?.trim() ?? '');
}

/**
 * A button of the confirmation bubble opened last. Closed bubbles stay in the page, and in
 * happy-dom their closing transition never ends, so the newest one (appended last) is taken.
 */
export function confirmButton(text: string): HTMLButtonElement {
  const bubbles = [...document.body.querySelectorAll('.ant-popover')].filter((p) => !p.classList.contains('ant-popover-hidden'));
  const found = [...(bubbles.at(-1)?.querySelectorAll('button') ?? [])].find((b) => b.textContent?.trim() === text);
  if (!found) throw new Error(`no button “${text}” in the confirmation opened last (${bubbles.length} in the page)`);
  return found;
}
