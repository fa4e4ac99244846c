import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { ComputeJob, ComputeOutcome } from './compute-notebook.js';

/** Longest a whole headless computation may take before its thread is stopped. */
export const JOB_TIME_LIMIT_MS = 5 * 60_000;

// Leave a core for the HTTP server; on a 2-core machine one job runs at a time.
const MAX_THREADS = Math.max(1, availableParallelism() - 1);
let running = 0;
const waiting: (() => void)[] = [];

/**
 * Computes a notebook in a worker thread (compiled build: dist/node/server/engine/
 * notebook-worker.js), so a long run never blocks the event loop that serves other
 * requests. Jobs beyond the number of spare cores wait their turn. Under TypeScript
 * sources (vitest, tsx) there is no compiled worker file: the job runs in-process with
 * the very same function.
 */
export async function computeInWorker(job: ComputeJob, timeLimitMs = JOB_TIME_LIMIT_MS): Promise<ComputeOutcome> {
  if (fileURLToPath(import.meta.url).endsWith('.ts')) {
    const { computeNotebook } = await import('./compute-notebook.js');
    return computeNotebook(job);
  }
  if (running >= MAX_THREADS) await new Promise<void>((resolve) => waiting.push(resolve));
  running++;
  try {
    return await inThread(job, timeLimitMs);
  } finally {
    running--;
    waiting.shift()?.();
  }
}

function inThread(job: ComputeJob, timeLimitMs: number): Promise<ComputeOutcome> {
  // Own copies of the bytes, so they can be moved to the thread without detaching a buffer the caller (or the driver) still uses.
  const inputs = job.inputs.map((i) => ({ ...i, bytes: i.bytes.slice() }));
  const worker = new Worker(new URL('./notebook-worker.js', import.meta.url), {
    workerData: { ...job, inputs },
    transferList: inputs.map((i) => i.bytes.buffer as ArrayBuffer),
  });
  return new Promise<ComputeOutcome>((resolve, reject) => {
    const timer = setTimeout(() => {
      void worker.terminate();
      resolve({ ok: false, error: { code: 'time_limit', message: `The computation took longer than ${Math.round(timeLimitMs / 1000)} s and was stopped.` } });
    }, timeLimitMs);
    worker.once('message', (outcome: ComputeOutcome) => {
      clearTimeout(timer);
      resolve(outcome);
      void worker.terminate();
    });
    worker.once('error', (error) => {
      clearTimeout(timer);
      reject(error);
    });
    worker.once('exit', (code) => {
      clearTimeout(timer);
      if (code !== 0) reject(new Error(`notebook worker exited with code ${code}`));
    });
  });
}
