import { parentPort, workerData } from 'node:worker_threads';
import { computeNotebook, type ComputeJob } from './compute-notebook.js';

// Thread entry: compute the one job it was started with, post the outcome, end.
const outcome = await computeNotebook(workerData as ComputeJob).catch((error: unknown) => ({
  ok: false as const,
  error: { code: 'engine_failed', message: error instanceof Error ? error.message : String(error) },
}));
parentPort!.postMessage(outcome);
