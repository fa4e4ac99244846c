import { closeSync, openSync, readFileSync, statSync, unlinkSync, writeSync } from 'node:fs';
import { join } from 'node:path';

/** Thrown when another live process holds the data folder. */
export class DataDirLockedError extends Error {
  override readonly name = 'DataDirLockedError';
  constructor(
    readonly dataDir: string,
    readonly pid: number,
  ) {
    super(`Another Cogbook server (${pid > 0 ? `pid ${pid}` : 'starting now'}) is using ${dataDir}; stop it first or choose another DATA_DIR.`);
  }
}

/** A held lock; `release` is safe to call more than once. */
export interface DataDirLock {
  file: string;
  release(): void;
}

/**
 * Takes the exclusive lock on a PGlite data folder: a file created with O_EXCL that
 * holds our PID. PGlite itself does not stop two processes from opening one folder
 * (they silently lose each other's rows), so this is the only guard. A lock file left
 * by a process that no longer runs is taken over.
 *
 * @throws DataDirLockedError when a live process holds the lock.
 */
export function acquireDataDirLock(dataDir: string): DataDirLock {
  const file = join(dataDir, 'cogbook.lock');
  for (let attempt = 0; attempt < 3; attempt++) {
    try {
      const fd = openSync(file, 'wx', 0o600);
      writeSync(fd, `${process.pid}\n`);
      closeSync(fd);
      let held = true;
      return {
        file,
        release() {
          if (!held) return;
          held = false;
          // Only remove the file if it is still ours.
          if (readPid(file) === process.pid) unlinkSync(file);
        },
      };
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== 'EEXIST') throw error;
      const pid = readPid(file);
      if (pid !== undefined && pid !== process.pid && isAlive(pid)) throw new DataDirLockedError(dataDir, pid);
      // A file without a PID is either being written this instant or left by a crash
      // between create and write: only an old one is stale.
      if (pid === undefined && Date.now() - mtimeMs(file) < 10_000) throw new DataDirLockedError(dataDir, 0);
      // Stale (its process is gone): take it over.
      try {
        unlinkSync(file);
      } catch (unlinkError) {
        if ((unlinkError as NodeJS.ErrnoException).code !== 'ENOENT') throw unlinkError;
      }
    }
  }
  throw new Error(`Could not take the lock ${file}: it keeps reappearing.`);
}

function readPid(file: string): number | undefined {
  try {
    const pid = Number.parseInt(readFileSync(file, 'utf8').trim(), 10);
    return Number.isInteger(pid) && pid > 0 ? pid : undefined;
  } catch {
    return undefined;
  }
}

function mtimeMs(file: string): number {
  try {
    return statSync(file).mtimeMs;
  } catch {
    return 0;
  }
}

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch (error) {
    // EPERM: the process exists but belongs to someone else.
    if ((error as NodeJS.ErrnoException).code !== 'EPERM') return false;
  }
  return !pidReusedByOtherProgram(pid);
}

/**
 * After a crash and a reboot the PID may belong to some unrelated program; where
 * /proc tells us the command line, only a Node process counts as the holder.
 */
function pidReusedByOtherProgram(pid: number): boolean {
  try {
    const cmdline = readFileSync(`/proc/${pid}/cmdline`, 'utf8');
    return cmdline.length > 0 && !/node/i.test(cmdline);
  } catch {
    return false;
  }
}
