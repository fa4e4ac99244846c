import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import type { Snapshot } from '../../shared/api/snapshots.js';
import type { ComputeJob, ComputeOutcome } from './compute-notebook.js';
import type { DrawJob } from './notebook-worker.js';
import { WorkerPool, WorkerTimeLimitError } from './worker-pool.js';

/** Longest a whole headless computation may take before its thread is stopped. */
export const JOB_TIME_LIMIT_MS = 5 * 60_000;

/** Threads in the compute pool unless configured: two, or one on a single-core machine. */
export const DEFAULT_COMPUTE_THREADS = Math.min(2, availableParallelism());

// One pool per process, made on the first job so a server that never computes starts no threads.
let pool: WorkerPool<ComputeJob | DrawJob, ComputeOutcome> | undefined;
let poolSize = DEFAULT_COMPUTE_THREADS;

/** Sets the compute pool's size (the server's WORKER_THREADS); takes effect when the pool is made. */
export function configureComputeThreads(size: number): void {
  poolSize = Math.max(1, Math.floor(size));
}

/**
 * Computes a notebook on the warm worker-thread pool (compiled build: dist/node/server/
 * engine/notebook-worker.js), so a long run never blocks the event loop that serves other
 * requests. Jobs beyond the pool's size wait for a free thread; a job past its limit
 * answers `time_limit` and its thread is replaced. Under TypeScript sources (vitest, tsx)
 * there is no compiled worker file: the job runs in-process with the very same function.
 */
export async function computeInWorker(job: ComputeJob, timeLimitMs = JOB_TIME_LIMIT_MS): Promise<ComputeOutcome> {
  if (fileURLToPath(import.meta.url).endsWith('.ts')) {
    const { default: computeJob } = await import('./notebook-worker.js');
    return computeJob(job);
  }
  pool ??= newPool();
  // Own copies of the bytes, so they can be moved to the thread without detaching a buffer the caller (or the driver) still uses.
  const inputs = job.inputs.map((i) => ({ ...i, bytes: i.bytes.slice() }));
  try {
    return await pool.run({ ...job, inputs }, { timeLimitMs, transferList: inputs.map((i) => i.bytes.buffer as ArrayBuffer) });
  } catch (error) {
    if (error instanceof WorkerTimeLimitError) {
      return { ok: false, error: { code: 'time_limit', message: `The computation took longer than ${Math.round(timeLimitMs / 1000)} s and was stopped.` } };
    }
    const message = error instanceof Error ? error.message : String(error);
    return { ok: false, error: { code: 'engine_failed', message: `The computing thread stopped: ${message}` } };
  }
}

function newPool(): WorkerPool<ComputeJob | DrawJob, ComputeOutcome> {
  return new WorkerPool<ComputeJob | DrawJob, ComputeOutcome>({
    filename: new URL('./notebook-worker.js', import.meta.url),
    size: poolSize,
    timeLimitMs: JOB_TIME_LIMIT_MS,
  });
}

/**
 * Draws the charts of a stored snapshot as SVG (drawSnapshotCharts) on the compute pool, so
 * vega never runs on the thread that serves requests; answers the drawn copy. Under
 * TypeScript sources it runs in-process, as computeInWorker does.
 */
export async function drawChartsInWorker(snapshot: Snapshot, timeLimitMs = JOB_TIME_LIMIT_MS): Promise<ComputeOutcome> {
  if (fileURLToPath(import.meta.url).endsWith('.ts')) {
    const { default: computeJob } = await import('./notebook-worker.js');
    return computeJob({ drawSnapshot: structuredClone(snapshot) });
  }
  pool ??= newPool();
  try {
    return await pool.run({ drawSnapshot: snapshot }, { timeLimitMs });
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    return { ok: false, error: { code: error instanceof WorkerTimeLimitError ? 'time_limit' : 'engine_failed', message } };
  }
}
