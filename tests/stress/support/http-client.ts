import { emptyNotebook, type NotebookDocument } from '../../../shared/notebook/document.js';

/** A signed-in client of a running server: cookie and Origin on every call, like the SPA. */
export interface Client {
  url: string;
  cookie: string;
  /** fetch with the session cookie, the server's own Origin and a time limit. */
  call(path: string, init?: RequestInit & { timeoutMs?: number }): Promise<Response>;
  json<T>(path: string, init?: RequestInit & { timeoutMs?: number }): Promise<{ status: number; body: T }>;
}

export const SIGN_UP_PASSWORD = 'crash-test-password-1';

/** Wraps a base URL and cookie into a {@link Client}. `origin` defaults to the base URL. */
export function clientFor(url: string, cookie: string, origin: string = url): Client {
  const call = (path: string, init: RequestInit & { timeoutMs?: number } = {}) => {
    // Generous: on a loaded two-core machine a freshly restarted server can take long to answer.
    const { timeoutMs = 60_000, ...rest } = init;
    const headers = new Headers(rest.headers);
    if (cookie) headers.set('cookie', cookie);
    if (!headers.has('origin')) headers.set('origin', origin);
    return fetch(`${url}${path}`, { ...rest, headers, signal: AbortSignal.timeout(timeoutMs) });
  };
  return {
    url,
    cookie,
    call,
    async json<T>(path: string, init: RequestInit & { timeoutMs?: number } = {}) {
      const res = await call(path, init);
      const text = await res.text();
      return { status: res.status, body: (text ? JSON.parse(text) : undefined) as T };
    },
  };
}

/** The `name=value` pairs of a response's Set-Cookie headers, as a Cookie header. */
export function cookieOf(res: Response): string {
  return res.headers
    .getSetCookie()
    .map((c) => c.split(';')[0])
    .join('; ');
}

/**
 * POSTs to a better-auth route from the server's own origin. In production better-auth
 * allows 3 sign-ins/sign-ups per 10 s per address; tests that need more wait as told.
 */
export async function authPost(url: string, path: string, body: unknown, headers: Record<string, string> = {}): Promise<Response> {
  for (let attempt = 0; ; attempt++) {
    const res = await fetch(`${url}${path}`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: url, ...headers },
      body: JSON.stringify(body),
    });
    // Only better-auth's own limit (its 429 carries X-Retry-After); the app's limit is what tests assert.
    const retryAfter = Number(res.headers.get('x-retry-after'));
    if (res.status !== 429 || !retryAfter || attempt >= 5) return res;
    await new Promise((r) => setTimeout(r, Math.min(retryAfter, 15) * 1000 + 100));
  }
}

/** Signs up a new account through better-auth's route and returns a client holding its session. */
export async function signUpClient(url: string, email: string, name = 'Crash Tester'): Promise<Client> {
  const res = await authPost(url, '/api/auth/sign-up/email', { email, password: SIGN_UP_PASSWORD, name });
  if (res.status !== 200) throw new Error(`sign-up of ${email} failed: ${res.status} ${await res.text()}`);
  return clientFor(url, cookieOf(res));
}

/** Signs in with e-mail and password and returns a client holding the new session. */
export async function signInClient(url: string, email: string, password = SIGN_UP_PASSWORD): Promise<Client> {
  const res = await authPost(url, '/api/auth/sign-in/email', { email, password });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${await res.text()}`);
  return clientFor(url, cookieOf(res));
}

/** The caller's personal workspace id. */
export async function personalWorkspace(client: Client): Promise<string> {
  const { body } = await client.json<{ workspaces: { id: string; personal: boolean }[] }>('/api/workspaces');
  const ws = body.workspaces.find((w) => w.personal);
  if (!ws) throw new Error('no personal workspace');
  return ws.id;
}

/** Creates a notebook and returns its id. */
export async function createNotebook(client: Client, workspaceId: string, document: NotebookDocument = emptyNotebook('Crash target')): Promise<string> {
  const { status, body } = await client.json<{ notebook: { id: string } }>('/api/notebooks', {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ workspaceId, document }),
  });
  if (status !== 201) throw new Error(`create notebook: ${status} ${JSON.stringify(body)}`);
  return body.notebook.id;
}

/** A deterministic PRNG (mulberry32), so a failing run can be replayed from its seed. */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
