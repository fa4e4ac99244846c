import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startServer, type RunningServer } from '../../browser/support/server.js';

/**
 * One data folder that outlives its server processes: start, SIGKILL, start again.
 * Runs the built server (`node dist/node/server/index.js`, from `npm run build:node`)
 * on embedded PGlite, without the demo lab, so each start is quick.
 */
export interface CrashSite {
  dataDir: string;
  server: RunningServer;
  /** SIGKILLs the server and waits until the process is gone (reaped, so its PID is dead). */
  kill(): Promise<void>;
  /** Starts a new server on the same folder; resolves when /api/health answers. Returns the start time in ms. */
  restart(): Promise<number>;
  /** True when the lock file of the killed process is still there (a crash leaves it). */
  staleLockLeft(): boolean;
  /** PID written in the lock file, if any. */
  lockPid(): number | undefined;
  /** Stops the server cleanly and, unless `keep`, removes the folder. */
  close(keep?: boolean): Promise<void>;
}

// A busy machine can take well over a minute to create a fresh PGlite folder.
const START = { readyWithinMs: 180_000 };

export async function openCrashSite(env: Record<string, string> = {}): Promise<CrashSite> {
  const dataDir = mkdtempSync(join(tmpdir(), 'cogbook-crash-'));
  const fullEnv = {
    DATA_DIR: dataDir,
    DATABASE_URL: '',
    SEED_DEMO: '0',
    AUTH_SECRET: 'crash-test-secret-crash-test-secret-0123',
    LOG_LEVEL: 'warn',
    ...env,
  };
  const lockFile = join(dataDir, 'cogbook.lock');
  const site: CrashSite = {
    dataDir,
    server: await startServer(fullEnv, START),
    async kill() {
      const child = site.server.child;
      if (child.exitCode !== null || child.signalCode !== null) return;
      const gone = new Promise<void>((resolve) => child.once('exit', () => resolve()));
      child.kill('SIGKILL');
      await gone;
    },
    async restart() {
      const started = Date.now();
      site.server = await startServer(fullEnv, START);
      return Date.now() - started;
    },
    staleLockLeft: () => existsSync(lockFile),
    lockPid() {
      try {
        const pid = Number.parseInt(readFileSync(lockFile, 'utf8'), 10);
        return Number.isInteger(pid) ? pid : undefined;
      } catch {
        return undefined;
      }
    },
    async close(keep = false) {
      await site.server.stop();
      if (!keep) rmSync(dataDir, { recursive: true, force: true });
    },
  };
  return site;
}
