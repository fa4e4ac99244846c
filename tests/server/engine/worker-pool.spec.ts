import { afterEach, describe, expect, it } from 'vitest';
import { WorkerPool, WorkerTimeLimitError } from '../../../server/engine/worker-pool.js';

interface Task {
  kind: 'sleep' | 'spin' | 'exit' | 'throw-outside' | 'bytes';
  ms?: number;
  buffer?: ArrayBuffer;
}
interface Done {
  threadId: number;
  loadedAt: number;
  startedAt: number;
  endedAt: number;
  sum?: number;
}

const fixture = new URL('./pool-worker.fixture.mjs', import.meta.url);
const pools: WorkerPool<Task, Done>[] = [];

function makePool(size: number, timeLimitMs = 30_000): WorkerPool<Task, Done> {
  const pool = new WorkerPool<Task, Done>({ filename: fixture, size, timeLimitMs });
  pools.push(pool);
  return pool;
}

/** Most intervals covering one instant: sweep over start (+1) and end (-1) points. */
function maxOverlap(jobs: Done[]): number {
  const points = jobs.flatMap((j) => [
    [j.startedAt, 1],
    [j.endedAt, -1],
  ]);
  // An end and a start at the same millisecond do not overlap: ends first.
  points.sort((a, b) => a[0]! - b[0]! || a[1]! - b[1]!);
  let now = 0;
  let most = 0;
  for (const [, step] of points) {
    now += step!;
    most = Math.max(most, now);
  }
  return most;
}

afterEach(async () => {
  await Promise.all(pools.splice(0).map((p) => p.destroy()));
});

describe('WorkerPool', () => {
  it('keeps its threads warm: later jobs reuse a thread that loaded the module once, and skip the start-up', async () => {
    const pool = makePool(1);
    let t0 = performance.now();
    const first = await pool.run({ kind: 'sleep', ms: 0 });
    const firstMs = performance.now() - t0;
    t0 = performance.now();
    const second = await pool.run({ kind: 'sleep', ms: 0 });
    const secondMs = performance.now() - t0;
    const third = await pool.run({ kind: 'sleep', ms: 0 });
    expect(second.threadId).toBe(first.threadId);
    expect(third.threadId).toBe(first.threadId);
    // Same module instance: its load time is the one the first job saw.
    expect(second.loadedAt).toBe(first.loadedAt);
    expect(third.loadedAt).toBe(first.loadedAt);
    // The first job waited for a thread to start and load the module; the second did not.
    expect(secondMs).toBeLessThan(firstMs);
  });

  it('moves transferred buffers to the thread', async () => {
    const pool = makePool(1);
    const bytes = new Uint8Array([1, 2, 3, 250]);
    const done = await pool.run({ kind: 'bytes', buffer: bytes.buffer }, { transferList: [bytes.buffer] });
    expect(done.sum).toBe(256);
    // Moved, not copied: the caller's view is detached.
    expect(bytes.byteLength).toBe(0);
  });

  it('stops a job past its limit, replaces the thread, and does not charge queue time to the next job', async () => {
    const pool = makePool(1);
    const before = (await pool.run({ kind: 'sleep', ms: 0 })).threadId;
    const t0 = performance.now();
    const stuck = pool.run({ kind: 'spin', ms: 20_000 }, { timeLimitMs: 3000 });
    // Queued behind the stuck job for ~3 s, itself limited to 2.5 s: fine only if its clock starts at
    // pick-up (the margin covers starting the replacement thread on a busy machine).
    const queued = pool.run({ kind: 'sleep', ms: 50 }, { timeLimitMs: 2500 });
    await expect(stuck).rejects.toBeInstanceOf(WorkerTimeLimitError);
    expect(performance.now() - t0).toBeLessThan(15_000);
    const next = await queued;
    expect(next.threadId).not.toBe(before);
    expect((await pool.run({ kind: 'sleep', ms: 0 })).threadId).toBe(next.threadId);
    expect(pool.threadIds).toHaveLength(1);
  });

  it('fails only the crashing job: a thread exiting or throwing outside the job leaves the other job and the pool working', async () => {
    const pool = makePool(2);
    const [exited, calm] = await Promise.allSettled([pool.run({ kind: 'exit' }), pool.run({ kind: 'sleep', ms: 300 })]);
    expect(exited.status).toBe('rejected');
    expect(String((exited as PromiseRejectedResult).reason)).toMatch(/exited with code: 7/);
    expect(calm.status).toBe('fulfilled');

    await expect(pool.run({ kind: 'throw-outside' })).rejects.toThrow('thread fell over');
    const after = await Promise.all([pool.run({ kind: 'sleep', ms: 100 }), pool.run({ kind: 'sleep', ms: 100 })]);
    expect(after.map((d) => d.endedAt > 0)).toEqual([true, true]);
    expect(pool.threadIds).toHaveLength(2);
  });

  it('runs at most `size` jobs at once and queues the rest', async () => {
    const pool = makePool(2);
    let seenActive = 0;
    let seenQueued = 0;
    const jobs = Array.from({ length: 6 }, () => pool.run({ kind: 'sleep', ms: 150 }));
    const watch = setInterval(() => {
      seenActive = Math.max(seenActive, pool.active);
      seenQueued = Math.max(seenQueued, pool.queued);
    }, 10);
    const done = await Promise.all(jobs);
    clearInterval(watch);
    expect(maxOverlap(done)).toBe(2);
    expect(seenActive).toBeLessThanOrEqual(2);
    expect(seenQueued).toBeGreaterThan(0);
    expect(new Set(done.map((d) => d.threadId)).size).toBe(2);
    expect(pool.active).toBe(0);
  });
});
