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

/** Under TypeScript sources (vitest, tsx) there is no compiled worker file. */
const IN_PROCESS = fileURLToPath(import.meta.url).endsWith('.ts');

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
  if (IN_PROCESS) return runInProcess(job);
  // Own copies of the bytes, so they can be moved to the thread without detaching a buffer the caller (or the driver) still uses.
  const inputs = job.inputs.map((i) => ({ ...i, bytes: i.bytes.slice() }));
  return runOnPool({ ...job, inputs }, timeLimitMs, inputs.map((i) => i.bytes.buffer as ArrayBuffer));
}

/**
 * Draws the charts of a stored snapshot as SVG (drawSnapshotCharts) on the compute pool, so
 * vega never runs on the thread that serves requests; answers the drawn copy. Under
 * TypeScript sources it runs in-process, as computeInWorker does (on a copy, as a thread would).
 */
export async function drawChartsInWorker(snapshot: Snapshot, timeLimitMs = JOB_TIME_LIMIT_MS): Promise<ComputeOutcome> {
  return IN_PROCESS ? runInProcess({ drawSnapshot: structuredClone(snapshot) }) : runOnPool({ drawSnapshot: snapshot }, timeLimitMs);
}

async function runInProcess(job: ComputeJob | DrawJob): Promise<ComputeOutcome> {
  const { default: computeJob } = await import('./notebook-worker.js');
  return computeJob(job);
}

/** One job on the pool (made on the first); a stopped or crashed thread becomes a failed outcome. */
async function runOnPool(job: ComputeJob | DrawJob, timeLimitMs: number, transferList?: ArrayBuffer[]): Promise<ComputeOutcome> {
  pool ??= new WorkerPool<ComputeJob | DrawJob, ComputeOutcome>({
    filename: new URL('./notebook-worker.js', import.meta.url),
    size: poolSize,
    timeLimitMs: JOB_TIME_LIMIT_MS,
  });
  try {
    return await pool.run(job, { timeLimitMs, ...(transferList ? { transferList } : {}) });
  } catch (error) {
    if (error instanceof WorkerTimeLimitError) {
      return { ok: false, error: { code: 'time_limit', message: `The computation took longer than ${Math.round(timeLimitMs / 1000)} s and was stopped.` } };
    }
    const message = error instanceof Error ? error.message : String(error);
    return { ok: false, error: { code: 'engine_failed', message: `The computing thread stopped: ${message}` } };
  }
}
