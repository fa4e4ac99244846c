import { computeNotebook, type ComputeJob, type ComputeOutcome } from './compute-notebook.js';

/**
 * Thread entry for the warm pool: the module loads once per thread, and each job calls
 * this. An engine exception becomes an `engine_failed` outcome rather than a thrown
 * error, so only a real crash of the thread rejects the job.
 */
export default async function computeJob(job: ComputeJob): Promise<ComputeOutcome> {
  return computeNotebook(job).catch((error: unknown) => ({
    ok: false as const,
    error: { code: 'engine_failed', message: error instanceof Error ? error.message : String(error) },
  }));
}
