import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import { ROOT_DIR } from './test-app.js';

export interface RunningServer {
  child: ChildProcess;
  url: string;
  output(): string;
  /** Sends SIGTERM and resolves with the exit code. */
  stop(): Promise<number | null>;
}

/** A port nobody listens on right now. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as { port: number };
      srv.close(() => resolve(port));
    });
  });
}

/** Starts `node --import tsx server/index.ts` (the real process, so its PID is the server's). */
export function spawnServer(env: Record<string, string>): ChildProcess {
  return spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: ROOT_DIR,
    env: { PATH: process.env.PATH ?? '', HOME: process.env.HOME ?? '/tmp', LOG_LEVEL: 'warn', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
}

/** Starts a server and waits for its "running at" line. */
export async function startServer(env: Record<string, string>, timeoutMs = 120_000): Promise<RunningServer> {
  const child = spawnServer(env);
  let out = '';
  child.stdout!.on('data', (d: Buffer) => (out += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (out += d.toString()));
  const url = await new Promise<string>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start in ${timeoutMs} ms:\n${out}`)), timeoutMs);
    const check = () => {
      const m = /running at (http:\/\/\S+)/.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve(m[1]!);
      }
    };
    child.stdout!.on('data', check);
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`server exited with ${code} before starting:\n${out}`));
    });
  });
  return {
    child,
    url,
    output: () => out,
    stop: () =>
      new Promise((resolve) => {
        if (child.exitCode !== null) return resolve(child.exitCode);
        child.once('exit', (code) => resolve(code));
        child.kill('SIGTERM');
      }),
  };
}

/** Runs a server expected to fail; resolves with its exit code and output. */
export function runToExit(env: Record<string, string>, timeoutMs = 60_000): Promise<{ code: number | null; output: string }> {
  const child = spawnServer(env);
  let out = '';
  child.stdout!.on('data', (d: Buffer) => (out += d.toString()));
  child.stderr!.on('data', (d: Buffer) => (out += d.toString()));
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`process did not exit in ${timeoutMs} ms:\n${out}`));
    }, timeoutMs);
    child.once('exit', (code) => {
      clearTimeout(timer);
      resolve({ code, output: out });
    });
  });
}
