import { QueryClient, VueQueryPlugin } from '@tanstack/vue-query';
import { flushPromises, mount, type ComponentMountingOptions } from '@vue/test-utils';
import { createPinia, setActivePinia, type Pinia } from 'pinia';
import { vi } from 'vitest';
import type { Component } from 'vue';
import { createMemoryHistory, createRouter, type Router } from 'vue-router';

/** One answer of the stand-in server. */
export interface Reply {
  status?: number;
  body?: unknown;
}

/** A request the component made, with its parsed JSON body. */
export interface SeenRequest {
  method: string;
  path: string;
  body: unknown;
}

/**
 * Replaces fetch with a table of routes (`'GET /api/x'` -> reply or function) and
 * records every request. An unknown route answers 500 so a test sees it.
 */
export function fakeServer(routes: Record<string, Reply | ((body: unknown, path: string) => Reply)>) {
  const seen: SeenRequest[] = [];
  vi.stubGlobal('fetch', async (input: string, init: RequestInit = {}) => {
    const method = init.method ?? 'GET';
    const path = String(input);
    const body = typeof init.body === 'string' ? (JSON.parse(init.body) as unknown) : init.body;
    seen.push({ method, path, body });
    const route = routes[`${method} ${path.split('?')[0]}`] ?? routes[`${method} ${path}`];
    const reply = typeof route === 'function' ? route(body, path) : (route ?? { status: 500, body: { error: { code: 'internal', message: `no route ${method} ${path}` } } });
    const status = reply.status ?? 200;
    return new Response(status === 204 || reply.body === undefined ? null : JSON.stringify(reply.body), {
      status,
      headers: { 'content-type': 'application/json' },
    });
  });
  return seen;
}

export interface Mounted {
  router: Router;
  pinia: Pinia;
}

/** Mounts with a fresh query cache, Pinia and a memory router that knows the notebook route. */
export async function mountCollab<C extends Component>(component: C, options: ComponentMountingOptions<C> = {}) {
  const pinia = createPinia();
  setActivePinia(pinia);
  const stub = { template: '<div />' };
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [
      { path: '/', component: stub },
      { path: '/notebooks/:id', name: 'notebook', component: stub },
      { path: '/sign-in', name: 'sign-in', component: stub },
    ],
  });
  await router.push('/');
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
  const wrapper = mount(component, {
    attachTo: document.body,
    ...options,
    global: { plugins: [pinia, router, [VueQueryPlugin, { queryClient }]], ...(options.global ?? {}) },
  } as ComponentMountingOptions<C>);
  await flushPromises();
  return { wrapper, router, pinia, queryClient };
}

/** Every button in the page (dialogs are teleported to the body) whose text matches. */
export function buttonNamed(text: string | RegExp): HTMLButtonElement {
  const found = [...document.body.querySelectorAll('button')].find((b) => (typeof text === 'string' ? b.textContent?.trim() === text : text.test(b.textContent ?? '')));
  if (!found) throw new Error(`no button “${String(text)}” in: ${[...document.body.querySelectorAll('button')].map((b) => b.textContent?.trim()).join(' | ')}`);
  return found as HTMLButtonElement;
}

/** Clicks and waits for the answers and the re-render. */
export async function click(el: Element): Promise<void> {
  (el as HTMLElement).click();
  await flushPromises();
  await new Promise((r) => setTimeout(r, 0));
  await flushPromises();
}

export const NOW = '2026-03-01T10:00:00.000Z';
