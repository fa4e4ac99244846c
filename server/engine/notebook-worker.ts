import type { Snapshot } from '../../shared/api/snapshots.js';
import { drawSnapshotCharts } from './chart-svg.js';
import { computeNotebook, type ComputeJob, type ComputeOutcome } from './compute-notebook.js';

/** Draws the charts of a snapshot computed earlier that has none drawn (see drawChartsInWorker). */
export interface DrawJob {
  drawSnapshot: Snapshot;
}

/**
 * Thread entry for the warm pool: the module loads once per thread, and each job calls
 * this. An engine exception becomes an `engine_failed` outcome rather than a thrown
 * error, so only a real crash of the thread rejects the job.
 */
export default async function computeJob(job: ComputeJob | DrawJob): Promise<ComputeOutcome> {
  const work: Promise<ComputeOutcome> =
    'drawSnapshot' in job ? drawSnapshotCharts(job.drawSnapshot).then(() => ({ ok: true as const, snapshot: job.drawSnapshot })) : computeNotebook(job);
  return work.catch((error: unknown) => ({
    ok: false as const,
    error: { code: 'engine_failed', message: error instanceof Error ? error.message : String(error) },
  }));
}
