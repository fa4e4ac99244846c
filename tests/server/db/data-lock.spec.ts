import { spawn, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { acquireDataDirLock, DataDirLockedError } from '../../../server/db/data-lock.js';

const dirs: string[] = [];
const tempDir = () => {
  const d = mkdtempSync(join(tmpdir(), 'cogbook-lock-'));
  dirs.push(d);
  return d;
};
afterEach(() => {
  for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
});

describe('acquireDataDirLock', () => {
  it('writes our PID and removes the file on release', () => {
    const dir = tempDir();
    const lock = acquireDataDirLock(dir);
    expect(readFileSync(lock.file, 'utf8').trim()).toBe(String(process.pid));
    lock.release();
    expect(() => readFileSync(lock.file)).toThrow();
  });

  it('refuses while another live process holds it', async () => {
    const dir = tempDir();
    const holder = spawn(process.execPath, ['-e', 'setTimeout(() => {}, 30000)']);
    try {
      writeFileSync(join(dir, 'cogbook.lock'), `${holder.pid}\n`);
      expect(() => acquireDataDirLock(dir)).toThrow(DataDirLockedError);
      expect(() => acquireDataDirLock(dir)).toThrow(`pid ${holder.pid}`);
    } finally {
      holder.kill();
      await new Promise((r) => holder.once('exit', r));
    }
    // Its holder gone, the lock is taken over.
    const lock = acquireDataDirLock(dir);
    expect(readFileSync(lock.file, 'utf8').trim()).toBe(String(process.pid));
    lock.release();
  });

  it('treats an empty lock file as held while fresh and stale when old', () => {
    const dir = tempDir();
    const file = join(dir, 'cogbook.lock');
    writeFileSync(file, '');
    expect(() => acquireDataDirLock(dir)).toThrow(DataDirLockedError);
    const old = new Date(Date.now() - 60_000);
    utimesSync(file, old, old);
    acquireDataDirLock(dir).release();
  });

  it('takes over a lock whose PID now belongs to another program', async () => {
    const dir = tempDir();
    const other = spawn('sleep', ['30']);
    try {
      writeFileSync(join(dir, 'cogbook.lock'), `${other.pid}\n`);
      acquireDataDirLock(dir).release();
    } finally {
      other.kill();
      await new Promise((r) => other.once('exit', r));
    }
  });

  it('takes over a lock whose PID is dead', () => {
    const dir = tempDir();
    const dead = spawnSync(process.execPath, ['-e', '']).pid;
    writeFileSync(join(dir, 'cogbook.lock'), `${dead}\n`);
    acquireDataDirLock(dir).release();
  });
});
