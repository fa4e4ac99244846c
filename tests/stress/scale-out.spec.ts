import { request } from 'node:http';
import { createServer, connect, type Server, type Socket } from 'node:net';
import pg from 'pg';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { emptyNotebook } from '../../shared/notebook/document.js';
import { freePort, startServer, type RunningServer } from '../browser/support/server.js';
import { SIGN_UP_PASSWORD } from './support/http-client.js';

/**
 * Two server processes on one PostgreSQL behind one port: a round-robin TCP proxy gives
 * each new connection to the next process, and every request below uses a new
 * connection, so consecutive requests land on alternate processes.
 */
const adminUrl = process.env.TEST_POSTGRES_URL ?? (/^postgres(ql)?:\/\//.test(process.env.DATABASE_URL ?? '') ? process.env.DATABASE_URL : undefined);
const reason = 'needs PostgreSQL: set TEST_POSTGRES_URL (see .ci/run for a throwaway cluster)';

interface Proxy {
  url: string;
  served: number[];
  close(): Promise<void>;
}

/** One request on a fresh connection (no keep-alive), so the proxy picks the next process. */
function call(url: string, method: string, path: string, headers: Record<string, string>, body?: string | Buffer): Promise<{ status: number; headers: Record<string, string | string[] | undefined>; text: string }> {
  return new Promise((resolve, reject) => {
    const req = request(`${url}${path}`, { method, headers: { ...headers, connection: 'close' }, agent: false, timeout: 30_000 }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, text: Buffer.concat(chunks).toString('utf8') }));
    });
    req.on('timeout', () => req.destroy(new Error(`${method} ${path} timed out`)));
    req.on('error', reject);
    req.end(body);
  });
}

describe.skipIf(!adminUrl)(`two processes on one PostgreSQL${adminUrl ? '' : ` (skipped: ${reason})`}`, () => {
  const dbName = `cogbook_scale_${process.pid}_${Math.random().toString(36).slice(2, 8)}`;
  let servers: RunningServer[] = [];
  let proxy: Proxy;

  beforeAll(async () => {
    const admin = new pg.Client({ connectionString: adminUrl });
    await admin.connect();
    await admin.query(`CREATE DATABASE ${dbName}`);
    await admin.end();
    const dbUrl = new URL(adminUrl!);
    dbUrl.pathname = `/${dbName}`;
    const proxyPort = await freePort();
    const env = {
      DATABASE_URL: dbUrl.toString(),
      SEED_DEMO: '0',
      AUTH_SECRET: 'scale-out-secret-scale-out-secret-0123',
      BASE_URL: `http://127.0.0.1:${proxyPort}`,
    };
    // Both start at once: migrations must serialise on the advisory lock.
    servers = await Promise.all([startServer(env, { readyWithinMs: 180_000 }), startServer(env, { readyWithinMs: 180_000 })]);
    // The proxy listens where BASE_URL says: origin checks compare against it.
    proxy = await roundRobinProxyAt(proxyPort, servers.map((s) => Number(new URL(s.url).port)));
  }, 400_000);

  afterAll(async () => {
    await proxy?.close();
    for (const s of servers) await s.stop();
    if (adminUrl) {
      const admin = new pg.Client({ connectionString: adminUrl });
      await admin.connect();
      await admin.query(`DROP DATABASE IF EXISTS ${dbName} WITH (FORCE)`);
      await admin.end();
    }
  });

  it('shares sessions and data: made on one process, read on the other; signed out on one, refused on both', { timeout: 300_000 }, async () => {
    const origin = proxy.url;
    const json = { 'content-type': 'application/json', origin };
    const signUp = await call(proxy.url, 'POST', '/api/auth/sign-up/email', json, JSON.stringify({ email: 'scale@lab.test', password: SIGN_UP_PASSWORD, name: 'Scale' }));
    expect(signUp.status, signUp.text).toBe(200);
    const cookie = ([] as string[]).concat(signUp.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]).join('; ');
    const authed = { ...json, cookie };

    const before = [...proxy.served];
    const me = await call(proxy.url, 'GET', '/api/me', authed);
    expect(me.status).toBe(200);
    const workspaceId = (JSON.parse(me.text) as { workspaces: { id: string }[] }).workspaces[0]!.id;
    const created = await call(proxy.url, 'POST', '/api/notebooks', authed, JSON.stringify({ workspaceId, document: emptyNotebook('Made on one process') }));
    expect(created.status, created.text).toBe(201);
    const id = (JSON.parse(created.text) as { notebook: { id: string } }).notebook.id;
    // Read and save alternately: each step on the other process than the one before.
    let revision = 1;
    for (let i = 0; i < 6; i++) {
      const read = await call(proxy.url, 'GET', `/api/notebooks/${id}`, authed);
      expect(read.status).toBe(200);
      const got = JSON.parse(read.text) as { revision: number; document: { title: string } };
      expect(got.revision).toBe(revision);
      const saved = await call(proxy.url, 'PUT', `/api/notebooks/${id}`, authed, JSON.stringify({ baseRevision: revision, document: { ...emptyNotebook(`Save ${i}`) } }));
      expect(saved.status, saved.text).toBe(200);
      revision++;
    }
    // A stale save on the other process is refused: the revision check is in the database, not in memory.
    const stale = await call(proxy.url, 'PUT', `/api/notebooks/${id}`, authed, JSON.stringify({ baseRevision: 1, document: emptyNotebook('Stale') }));
    expect(stale.status).toBe(409);
    const used = proxy.served.map((n, i) => n - before[i]!);
    expect(Math.min(...used)).toBeGreaterThanOrEqual(6);

    // Each process directly sees the same notebook.
    for (const s of servers) {
      const direct = await call(s.url, 'GET', `/api/notebooks/${id}`, { ...authed, origin: s.url });
      expect(direct.status).toBe(200);
      expect((JSON.parse(direct.text) as { revision: number }).revision).toBe(revision);
    }

    const out = await call(proxy.url, 'POST', '/api/auth/sign-out', authed, '{}');
    expect(out.status, out.text).toBe(200);
    for (const s of servers) expect((await call(s.url, 'GET', '/api/me', { cookie })).status).toBe(401);
    expect((await call(proxy.url, 'GET', '/api/me', { cookie })).status).toBe(401);
    expect((await call(proxy.url, 'GET', '/api/me', { cookie })).status).toBe(401);
  });

  it('a published page kept in memory by both processes follows a republish and an unpublish made on one of them', { timeout: 300_000 }, async () => {
    const [a, b] = servers as [RunningServer, RunningServer];
    // Straight to each process (no proxy in between); Origin stays the one address they serve under.
    const json = { 'content-type': 'application/json', origin: proxy.url };
    const signUp = await call(a.url, 'POST', '/api/auth/sign-up/email', json, JSON.stringify({ email: 'publisher@lab.test', password: SIGN_UP_PASSWORD, name: 'Publisher' }));
    expect(signUp.status, signUp.text).toBe(200);
    const cookie = ([] as string[]).concat(signUp.headers['set-cookie'] ?? []).map((c) => c.split(';')[0]).join('; ');
    const onA = { ...json, cookie };
    const workspaceId = (JSON.parse((await call(a.url, 'GET', '/api/me', onA)).text) as { workspaces: { id: string }[] }).workspaces[0]!.id;
    const doc = { ...emptyNotebook('Published from A'), description: 'First findings.' };
    const created = await call(a.url, 'POST', '/api/notebooks', onA, JSON.stringify({ workspaceId, document: doc }));
    expect(created.status, created.text).toBe(201);
    const id = (JSON.parse(created.text) as { notebook: { id: string } }).notebook.id;
    const published = await call(a.url, 'POST', `/api/notebooks/${id}/publication`, onA, '{}');
    expect(published.status, published.text).toBe(200);
    const slug = (JSON.parse(published.text) as { slug: string }).slug;
    const page = `/api/published/${slug}`;
    const read = async (s: RunningServer, etag?: string) => {
      const res = await call(s.url, 'GET', page, etag ? { 'if-none-match': etag } : {});
      return { ...res, page: res.status === 200 ? (JSON.parse(res.text) as { revision: number; description: string }) : null };
    };

    // Both processes read it twice (the second answer comes from what each keeps).
    const first = await read(b);
    expect(first.status).toBe(200);
    expect(first.page!.description).toBe('First findings.');
    expect((await read(b)).headers.etag).toBe(first.headers.etag);
    expect((await read(a)).headers.etag).toBe(first.headers.etag);
    expect((await read(b, String(first.headers.etag))).status).toBe(304);

    // A saves and republishes; B, which was not told, answers the new revision at once.
    const saved = await call(a.url, 'PUT', `/api/notebooks/${id}`, onA, JSON.stringify({ baseRevision: 1, document: { ...doc, description: 'Second findings.' } }));
    expect(saved.status, saved.text).toBe(200);
    expect((await call(a.url, 'POST', `/api/notebooks/${id}/publication`, onA, '{}')).status).toBe(200);
    const second = await read(b, String(first.headers.etag));
    expect(second.status).toBe(200);
    expect(second.page).toMatchObject({ revision: 2, description: 'Second findings.' });
    expect(second.headers.etag).not.toBe(first.headers.etag);

    // A unpublishes; B answers 404 at once, with or without the tag it handed out.
    const gone = await call(a.url, 'DELETE', `/api/notebooks/${id}/publication`, onA);
    expect(gone.status, gone.text).toBe(204);
    expect((await read(b)).status).toBe(404);
    expect((await read(b, String(second.headers.etag))).status).toBe(404);
  });
});

/** A TCP proxy on `port` giving each new connection to the next backend port in turn. */
async function roundRobinProxyAt(port: number, backends: number[]): Promise<Proxy> {
  const served = backends.map(() => 0);
  const sockets = new Set<Socket>();
  let next = 0;
  const server: Server = createServer((client) => {
    const i = next++ % backends.length;
    served[i]!++;
    const upstream = connect(backends[i]!, '127.0.0.1');
    for (const s of [client, upstream]) {
      sockets.add(s);
      s.on('close', () => sockets.delete(s));
      s.on('error', () => s.destroy());
    }
    client.pipe(upstream).pipe(client);
  });
  await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve));
  return {
    url: `http://127.0.0.1:${port}`,
    served,
    close: () =>
      new Promise((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  };
}
