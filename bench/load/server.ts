import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** A Cogbook server process (the compiled build) under load. */
export interface LoadServer {
  url: string;
  /** `pglite` or `postgres`, as /api/health reports it. */
  database: string;
  /** Everything the process printed, for a failure message. */
  output(): string;
  /** How the process ended (`exited with code 1`, `killed by SIGABRT`), or null while it runs. */
  ended(): string | null;
  /** CPU time the server process has used so far (user + system), ms; NaN where /proc is missing. */
  cpuMs(): number;
  /** SIGTERM (SIGKILL after 10 s) and removes the temporary data folder. */
  stop(): Promise<void>;
}

export interface LoadServerOptions {
  /** PostgreSQL URL; without it the server uses embedded PGlite in a fresh temporary folder. */
  databaseUrl?: string;
  /** A fresh data folder takes a while, and the demo lab computes its published snapshot on first start. */
  readyWithinMs?: number;
  /** Extra node flags for the server process, e.g. `['--cpu-prof', '--cpu-prof-dir=/tmp/prof']` to profile it under load. */
  nodeArgs?: string[];
  /** Extra environment for the server process, e.g. `{ LOG_LEVEL: 'info' }`. */
  env?: Record<string, string>;
}

/** The repository root: the nearest folder above this file holding Cogbook's package.json (source or dist/node). */
export function repoRoot(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (;;) {
    const pkg = join(dir, 'package.json');
    if (existsSync(pkg) && (JSON.parse(readFileSync(pkg, 'utf8')) as { name?: string }).name === 'cogbook') return dir;
    const up = dirname(dir);
    if (up === dir) throw new Error('cannot find the Cogbook repository root above bench/load');
    dir = up;
  }
}

/**
 * Waits until the server has worked off what an ended run left queued: a load tool stops
 * at its deadline, but the server still answers every request it had already read, and
 * the next run would otherwise start behind that backlog. Settled = under 10 % of one core
 * over half a second, then one health check answered.
 */
export async function settle(server: LoadServer, withinMs = 120_000): Promise<void> {
  const deadline = Date.now() + withinMs;
  while (Date.now() < deadline) {
    const before = server.cpuMs();
    await new Promise((r) => setTimeout(r, 500));
    const used = server.cpuMs() - before;
    if (!(used > 50)) break; // NaN (no /proc) counts as settled
  }
  try {
    await fetch(`${server.url}/api/health`, { signal: AbortSignal.timeout(withinMs) });
  } catch (error) {
    throw new Error(`GET /api/health after the run: ${describeError(error)}`, { cause: error });
  }
}

/** Writes everything the server printed to a file in the temporary folder; answers a phrase naming it. */
export function saveServerOutput(server: LoadServer, label: string): string {
  const log = join(tmpdir(), `cogbook-load-${label.toLowerCase()}-${process.pid}-${Date.now()}.log`);
  try {
    writeFileSync(log, server.output());
    return `whole server output in ${log}`;
  } catch (error) {
    return `server output not saved: ${describeError(error)}`;
  }
}

/**
 * One line saying why a load run broke off, for a bench row or an assertion: the error with
 * its socket-level cause, whether the server was still running, its last line of output,
 * and the file holding the rest.
 */
export function describeLoadFailure(server: LoadServer, error: unknown, label: string): string {
  const last = server.output().trim().split('\n').at(-1)?.slice(0, 300) ?? '';
  return `${describeError(error)}; server ${server.ended() ?? 'still running'}; its last line: ${last || '(none)'}; ${saveServerOutput(server, label)}`;
}

/** fetch's errors wrap the socket's: name both, e.g. `TypeError: fetch failed (ECONNRESET: read ECONNRESET)`. */
export function describeError(error: unknown): string {
  if (!(error instanceof Error)) return String(error);
  const cause = error.cause as { code?: string; message?: string } | undefined;
  // A wrapped error (see the callers) already carries its cause's message.
  const why = cause && !(cause.message && error.message.includes(cause.message)) ? [cause.code, cause.message].filter(Boolean).join(': ') : '';
  return `${error.name}: ${error.message}${why ? ` (${why})` : ''}`;
}

/** utime + stime of a process from /proc/PID/stat (fields 14 and 15, in clock ticks of 10 ms on Linux). */
function processCpuMs(pid: number | undefined): number {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // The command name (field 2) may hold spaces: count fields after its closing parenthesis.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return (Number(fields[11]) + Number(fields[12])) * 10;
  } catch {
    return NaN;
  }
}

/** A loopback port nobody listens on right now. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      probe.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no free port'))));
    });
  });
}

/**
 * Starts `node dist/node/server/index.js` (from `npm run build:node`) in production mode
 * on 127.0.0.1 and a free port, with the demo lab seeded (so a published notebook exists),
 * and waits until /api/health answers.
 *
 * TRUST_PROXY=loopback lets the load driver give each editor its own client address in
 * X-Forwarded-For, as editors behind a reverse proxy would have: the sign-in limits
 * (the app's and better-auth's 3 per 10 s) then count per editor, not for all at once.
 */
export async function startLoadServer(options: LoadServerOptions = {}): Promise<LoadServer> {
  // The free port can be taken between probing it and the server binding it (other
  // processes on the machine start servers too): try again on another one.
  for (let attempt = 1; ; attempt++) {
    try {
      return await startOnce(options);
    } catch (error) {
      if (attempt >= 3 || !(error instanceof PortTakenError)) throw error;
    }
  }
}

class PortTakenError extends Error {}

async function startOnce(options: LoadServerOptions): Promise<LoadServer> {
  const root = repoRoot();
  const entry = join(root, 'dist/node/server/index.js');
  if (!existsSync(entry)) throw new Error(`${entry} is missing: run npm run build:node first`);
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  const dataDir = mkdtempSync(join(tmpdir(), 'cogbook-load-'));
  const child: ChildProcess = spawn(process.execPath, [...(options.nodeArgs ?? []), entry], {
    cwd: root,
    env: {
      PATH: process.env.PATH ?? '',
      HOME: process.env.HOME ?? tmpdir(),
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      BASE_URL: url,
      DATA_DIR: dataDir,
      DATABASE_URL: options.databaseUrl ?? '',
      SEED_DEMO: '1',
      TRUST_PROXY: 'loopback',
      AUTH_SECRET: 'load-bench-secret-load-bench-secret-0123',
      LOG_LEVEL: 'warn',
      ...options.env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  child.stdout?.on('data', (chunk: Buffer) => (output += chunk.toString()));
  child.stderr?.on('data', (chunk: Buffer) => (output += chunk.toString()));
  const stop = async () => {
    if (child.exitCode === null && child.signalCode === null) {
      const exited = new Promise((r) => child.once('exit', r));
      child.kill('SIGTERM');
      await Promise.race([exited, new Promise((r) => setTimeout(r, 10_000))]);
      if (child.exitCode === null && child.signalCode === null) {
        child.kill('SIGKILL');
        await exited;
      }
    }
    rmSync(dataDir, { recursive: true, force: true });
  };
  const deadline = Date.now() + (options.readyWithinMs ?? 300_000);
  for (;;) {
    if (child.exitCode !== null) {
      await stop();
      const message = `server exited early (${child.exitCode}): ${output.trim().split('\n').slice(-5).join(' | ')}`;
      throw /already in use/.test(output) ? new PortTakenError(message) : new Error(message);
    }
    try {
      const res = await fetch(`${url}/api/health`, { signal: AbortSignal.timeout(5_000) });
      if (res.ok) {
        const health = (await res.json()) as { database: string };
        const ended = () =>
          child.signalCode !== null ? `killed by ${child.signalCode}` : child.exitCode !== null ? `exited with code ${child.exitCode}` : null;
        return { url, database: health.database, output: () => output, ended, cpuMs: () => processCpuMs(child.pid), stop };
      }
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      await stop();
      throw new Error(`server did not answer /api/health within ${(options.readyWithinMs ?? 300_000) / 1000} s: ${output.trim().split('\n').slice(-5).join(' | ')}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
}
