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
    const { timeoutMs = 30_000, ...rest } = init;
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

/** Signs up a new account through better-auth's route and returns a client holding its session. */
export async function signUpClient(url: string, email: string, name = 'Crash Tester'): Promise<Client> {
  const res = await fetch(`${url}/api/auth/sign-up/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: url },
    body: JSON.stringify({ email, password: SIGN_UP_PASSWORD, name }),
  });
  if (res.status !== 200) throw new Error(`sign-up of ${email} failed: ${res.status} ${await res.text()}`);
  return clientFor(url, cookieOf(res));
}

/** Signs in with e-mail and password and returns a client holding the new session. */
export async function signInClient(url: string, email: string, password = SIGN_UP_PASSWORD): Promise<Client> {
  const res = await fetch(`${url}/api/auth/sign-in/email`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', origin: url },
    body: JSON.stringify({ email, password }),
  });
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
