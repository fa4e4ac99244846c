import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { freePort, runToExit, startServer, type RunningServer } from './helpers/spawn-server.js';
import { notebookDoc } from './helpers/fixtures.js';

const dataDir = mkdtempSync(join(tmpdir(), 'cogbook-proc-'));
const running: RunningServer[] = [];
afterAll(async () => {
  for (const s of running) await s.stop();
  rmSync(dataDir, { recursive: true, force: true });
});

/**
 * The real server as a process, with NODE_ENV=production: better-auth's origin checks
 * are off under NODE_ENV=test (vitest), so they can only be seen here.
 */
describe('the server process', () => {
  it('locks its data folder, refuses a second process, survives a restart and a stale lock', { timeout: 400_000 }, async () => {
    const port = await freePort();
    const env = { DATA_DIR: dataDir, PORT: String(port), NODE_ENV: 'production', AUTH_SECRET: 'process-test-secret-process-test-secret' };
    const first = await startServer(env);
    running.push(first);
    const origin = `http://localhost:${port}`;
    expect(first.output()).toContain('analyst@ridgeline.test');

    // The page carries the strict policy (whatever the client build state).
    const page = await fetch(`${first.url}/`);
    const csp = page.headers.get('content-security-policy') ?? '';
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toContain('unsafe-eval');

    // Cross-site sign-in is refused in production; same-site works.
    const body = JSON.stringify({ email: 'analyst@ridgeline.test', password: 'cogbook-demo' });
    const evil = await fetch(`${first.url}/api/auth/sign-in/email`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: 'http://evil.example' },
      body,
    });
    expect(evil.status).toBe(403);
    const signIn = await fetch(`${first.url}/api/auth/sign-in/email`, { method: 'POST', headers: { 'content-type': 'application/json', origin }, body });
    expect(signIn.status).toBe(200);
    const cookie = signIn.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const me = (await (await fetch(`${first.url}/api/me`, { headers: { cookie } })).json()) as { workspaces: { id: string; name: string }[] };
    const lab = me.workspaces.find((w) => w.name === 'Ridgeline Test Lab')!;
    expect(lab).toBeDefined();
    const created = await fetch(`${first.url}/api/notebooks`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin, cookie },
      body: JSON.stringify({ workspaceId: lab.id, document: notebookDoc({ title: 'Survives restarts' }) }),
    });
    expect(created.status).toBe(201);
    const notebookId = ((await created.json()) as { notebook: { id: string } }).notebook.id;
    const crossSite = await fetch(`${first.url}/api/notebooks`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', origin: 'http://evil.example', cookie },
      body: JSON.stringify({ workspaceId: lab.id, document: notebookDoc() }),
    });
    expect(crossSite.status).toBe(403);

    // A second process on the same folder exits at once with one clear line.
    const second = await runToExit({ ...env, PORT: String(await freePort()) });
    expect(second.code).not.toBe(0);
    expect(second.output).toContain(`Another Cogbook server (pid ${first.child.pid}) is using ${dataDir}`);
    const still = await fetch(`${first.url}/api/notebooks/${notebookId}`, { headers: { cookie } });
    expect(still.status).toBe(200);

    // A clean stop releases the lock.
    expect(await first.stop()).toBe(0);
    expect(existsSync(join(dataDir, 'cogbook.lock'))).toBe(false);

    // A lock left by a process that no longer runs does not block.
    const dead = spawnSync(process.execPath, ['-e', '']).pid;
    writeFileSync(join(dataDir, 'cogbook.lock'), `${dead}\n`);
    const again = await startServer(env);
    running.push(again);
    expect(again.output()).not.toContain('demo lab created');
    const reread = await fetch(`${again.url}/api/notebooks/${notebookId}`, { headers: { cookie } });
    expect(reread.status).toBe(200);
    expect(((await reread.json()) as { document: { title: string } }).document.title).toBe('Survives restarts');
    expect(await again.stop()).toBe(0);
  });
});
