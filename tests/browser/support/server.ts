import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** A real Cogbook server (built JS, as `npm start` runs it) on a free port with its own data directory. */
export interface RunningServer {
  url: string;
  dataDir: string;
  /** Everything the server printed, for diagnosing a failed test. */
  output: () => string;
  stop: () => Promise<void>;
  /** The server process itself (crash tests SIGKILL it). */
  child: ChildProcess;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      probe.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}

/**
 * Starts dist/node/server/index.js (built by `npm run build`, which `npm test` runs first)
 * and waits until /api/health answers.
 */
export async function startServer(env: Record<string, string> = {}, options: { readyWithinMs?: number } = {}): Promise<RunningServer> {
  const port = await freePort();
  const dataDir = env.DATA_DIR ?? mkdtempSync(join(tmpdir(), 'cogbook-browser-'));
  const child: ChildProcess = spawn(process.execPath, ['dist/node/server/index.js'], {
    // BASE_URL explicitly: vitest puts Vite's BASE_URL ('/') into process.env.
    env: { ...process.env, NODE_ENV: 'production', PORT: String(port), HOST: '127.0.0.1', BASE_URL: `http://127.0.0.1:${port}`, DATA_DIR: dataDir, LOG_LEVEL: 'warn', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout?.on('data', (chunk) => (output += chunk));
  child.stderr?.on('data', (chunk) => (output += chunk));
  const url = `http://127.0.0.1:${port}`;
  // A first start seeds the demo lab (and computes its published snapshot): on a busy machine that can take minutes.
  const readyWithinMs = options.readyWithinMs ?? 180_000;
  const deadline = Date.now() + readyWithinMs;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited early (${child.exitCode}):\n${output}`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`server did not become healthy within ${readyWithinMs / 1000} s:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    url,
    dataDir,
    child,
    output: () => output,
    stop: async () => {
      if (child.exitCode === null) {
        const exited = new Promise((r) => child.once('exit', r));
        child.kill('SIGTERM');
        await Promise.race([exited, new Promise((r) => setTimeout(r, 10_000))]);
        if (child.exitCode === null) child.kill('SIGKILL');
      }
      if (!env.DATA_DIR) rmSync(dataDir, { recursive: true, force: true });
    },
  };
}
