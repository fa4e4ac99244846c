import { emptyNotebook, type NotebookDocument } from '../../shared/notebook/document.js';
import { percentile, type LoadFigures } from './figures.js';
import { describeError } from './server.js';

/** A signed-in account with a notebook of its own that it autosaves. */
export interface Editor {
  email: string;
  /** Client address sent as X-Forwarded-For (the server trusts loopback proxies). */
  address: string;
  cookie: string;
  notebookId: string;
  /** Revision the next save builds on: the last acknowledged one. */
  current: number;
  /** Every revision the server acknowledged with 200, in order. */
  acked: number[];
}

const PASSWORD = 'load-test-password-1';
/** A save unanswered after this long counts as an error (the editor would see it hang). */
const SAVE_TIMEOUT_MS = 60_000;

/** fetch, naming the request and the socket-level cause when it fails without an answer. */
async function send(url: string, init: RequestInit & { method: string }, path: string): Promise<Response> {
  try {
    return await fetch(`${url}${path}`, init);
  } catch (error) {
    throw new Error(`${init.method} ${path}: ${describeError(error)}`, { cause: error });
  }
}

function headersOf(url: string, address: string, cookie?: string): Record<string, string> {
  // Origin: the server refuses state-changing API calls from other sites.
  return { 'content-type': 'application/json', origin: url, 'x-forwarded-for': address, ...(cookie ? { cookie } : {}) };
}

/** Sign-up through better-auth; waits out its limiter (429 with X-Retry-After) should one address hit it. */
async function signUp(url: string, email: string, address: string): Promise<string> {
  for (let attempt = 0; ; attempt++) {
    const res = await send(url, {
      method: 'POST',
      headers: headersOf(url, address),
      body: JSON.stringify({ email, password: PASSWORD, name: `Load editor ${email.split('@')[0]}` }),
      signal: AbortSignal.timeout(60_000),
    }, '/api/auth/sign-up/email');
    const retryAfter = Number(res.headers.get('x-retry-after'));
    if (res.status === 429 && retryAfter && attempt < 5) {
      await new Promise((r) => setTimeout(r, Math.min(retryAfter, 15) * 1000 + 100));
      continue;
    }
    if (res.status !== 200) throw new Error(`sign-up of ${email} answered ${res.status}: ${await res.text()}`);
    const cookie = res.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; ');
    if (!cookie) throw new Error(`sign-up of ${email} set no session cookie`);
    return cookie;
  }
}

async function call<T>(url: string, editor: Pick<Editor, 'address' | 'cookie'>, method: string, path: string, body?: unknown): Promise<T> {
  const res = await send(url, {
    method,
    headers: headersOf(url, editor.address, editor.cookie),
    body: body === undefined ? undefined : JSON.stringify(body),
    signal: AbortSignal.timeout(60_000),
  }, path);
  const text = await res.text();
  if (!res.ok) throw new Error(`${method} ${path} answered ${res.status}: ${text.slice(0, 300)}`);
  return JSON.parse(text) as T;
}

/**
 * Signs up `count` accounts (each from its own client address, a few at a time, so
 * the sign-in limits stay out of the way) and creates one notebook in each one's
 * personal workspace. `label` keeps the e-mails of two runs on one database apart.
 */
export async function setUpEditors(url: string, count: number, label = 'load'): Promise<Editor[]> {
  const editors: Editor[] = [];
  const one = async (i: number): Promise<Editor> => {
    const email = `${label}.editor${i + 1}@load.test`;
    const address = `10.77.${(i >> 8) & 255}.${(i & 255) + 1}`;
    const cookie = await signUp(url, email, address);
    const who = { address, cookie };
    const { workspaces } = await call<{ workspaces: { id: string; personal: boolean }[] }>(url, who, 'GET', '/api/workspaces');
    const workspaceId = workspaces.find((w) => w.personal)?.id;
    if (!workspaceId) throw new Error(`${email} has no personal workspace`);
    const created = await call<{ notebook: { id: string }; revision: number }>(url, who, 'POST', '/api/notebooks', { workspaceId, document: documentFor(email, 0) });
    return { email, address, cookie, notebookId: created.notebook.id, current: created.revision, acked: [] };
  };
  // Sign-up hashes a password (scrypt): four at a time keeps a small machine responsive.
  for (let i = 0; i < count; i += 4) editors.push(...(await Promise.all(Array.from({ length: Math.min(4, count - i) }, (_, k) => one(i + k)))));
  return editors;
}

/** A notebook of a few kB as an editor leaves it between autosaves: notes whose text changes. */
function documentFor(email: string, save: number): NotebookDocument {
  const doc = emptyNotebook(`Load notebook of ${email}`);
  doc.description = `Autosave ${save}`;
  doc.cells = Array.from({ length: 6 }, (_, i) => ({
    id: `c${i}`,
    name: `note_${i}`,
    kind: 'note' as const,
    config: { markdown: `## Block ${i}\n\n${'Reference 250 W, device under test 253 W at 90 rpm. '.repeat(10)}\n\nEdit ${save}.${i}` },
  }));
  return doc;
}

export interface EditorRunOptions {
  url: string;
  editors: Editor[];
  durationS: number;
  /** Time between the starts of one editor's autosaves (a save still in flight delays the next). */
  intervalMs: number;
}

export interface EditorRun {
  saves: LoadFigures;
  /** Acknowledged saves whose revision was not base + 1 (the server reordered or skipped). */
  misnumbered: string[];
}

/**
 * Each editor PUTs its notebook every `intervalMs` on top of the last acknowledged
 * revision, starts spread over one interval. A save that gets no 200 leaves the base
 * as it was, so the next save retries on it.
 */
export async function runEditors(options: EditorRunOptions): Promise<EditorRun> {
  const { url, editors, intervalMs } = options;
  const latencies: number[] = [];
  const statuses: Record<string, number> = {};
  const misnumbered: string[] = [];
  const errorSamples: string[] = [];
  let errors = 0;
  const started = performance.now();
  const end = started + options.durationS * 1000;
  const sleepUntil = (t: number) => new Promise((r) => setTimeout(r, Math.max(0, t - performance.now())));

  const editorLoop = async (editor: Editor, index: number) => {
    let due = started + (index * intervalMs) / editors.length;
    let save = 0;
    while (due < end) {
      await sleepUntil(due);
      save++;
      const base = editor.current;
      const t0 = performance.now();
      try {
        const res = await fetch(`${url}/api/notebooks/${editor.notebookId}`, {
          method: 'PUT',
          headers: headersOf(url, editor.address, editor.cookie),
          body: JSON.stringify({ baseRevision: base, document: documentFor(editor.email, save), summary: `autosave ${save}` }),
          signal: AbortSignal.timeout(SAVE_TIMEOUT_MS),
        });
        const text = await res.text();
        latencies.push(performance.now() - t0);
        statuses[res.status] = (statuses[res.status] ?? 0) + 1;
        if (res.status === 200) {
          const revision = (JSON.parse(text) as { revision: number }).revision;
          if (revision !== base + 1) misnumbered.push(`${editor.email}: save on ${base} acknowledged as revision ${revision}`);
          editor.acked.push(revision);
          editor.current = revision;
        }
      } catch (error) {
        errors++;
        if (errorSamples.length < 3) errorSamples.push(`${editor.email} save ${save} after ${((performance.now() - t0) / 1000).toFixed(1)} s: ${describeError(error)}`);
      }
      // Autosave fires when due; a slow save pushes the next one back instead of bunching them.
      due = Math.max(due + intervalMs, performance.now());
    }
  };
  await Promise.all(editors.map(editorLoop));
  const seconds = (performance.now() - started) / 1000;
  const answered = latencies.length;
  return {
    saves: {
      requests: answered,
      perSecond: answered / seconds,
      p50Ms: percentile(latencies, 50),
      p99Ms: percentile(latencies, 99),
      errors,
      non2xx: Object.entries(statuses).reduce((n, [code, count]) => n + (code.startsWith('2') ? 0 : count), 0),
      statuses,
      errorSamples,
    },
    misnumbered,
  };
}

/** What the revision history says about the acknowledged saves. */
export interface SaveAudit {
  acknowledged: number;
  /** Acknowledged revisions missing from the history, e.g. `a@x: 17`. */
  lost: string[];
  /** Histories that are not exactly 1..head, or whose head is not the last acknowledged save. */
  problems: string[];
}

/** Reads every editor's revision history and checks every acknowledged revision is in it. */
export async function auditSaves(url: string, editors: Editor[]): Promise<SaveAudit> {
  const audit: SaveAudit = { acknowledged: 0, lost: [], problems: [] };
  for (const editor of editors) {
    const { revisions } = await call<{ revisions: { revision: number }[] }>(url, editor, 'GET', `/api/notebooks/${editor.notebookId}/revisions`);
    const have = new Set(revisions.map((r) => r.revision));
    audit.acknowledged += editor.acked.length;
    for (const revision of editor.acked) if (!have.has(revision)) audit.lost.push(`${editor.email}: ${revision}`);
    const head = Math.max(0, ...have);
    if (head !== editor.current) audit.problems.push(`${editor.email}: history ends at ${head}, last acknowledged ${editor.current}`);
    if (revisions.length !== head || have.size !== head) audit.problems.push(`${editor.email}: ${revisions.length} revisions for a head of ${head} (gaps or duplicates)`);
  }
  return audit;
}
