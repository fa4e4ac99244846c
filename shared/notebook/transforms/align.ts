import { estimateOffset } from '../../engine/estimate-offset.js';
import { pairRecordings } from '../../engine/pair-recordings.js';
import { segmentsFromLaps } from '../../engine/segments-from-laps.js';
import type { NotebookTable } from '../cell-value.js';
import type { TransformConfig } from '../cell-config.js';
import { asRecording, type TransformInput } from './transform-input.js';

type AlignConfig = Extract<TransformConfig, { op: 'align' }>;

/**
 * Finds the clock offset of the test recording (or takes the manual one) and pairs it
 * with the reference on the reference's grid: columns `ref_power`, `test_power`, ...
 */
export function alignTransform(config: AlignConfig, reference: TransformInput, test: TransformInput): NotebookTable {
  const ref = asRecording(reference, 'align');
  const dut = asRecording(test, 'align');
  const estimate = estimateOffset(ref, dut, {
    maxLagS: config.maxLagS,
    intervalS: config.intervalS,
    ...(config.mode === 'manual' ? { manualOffsetS: config.offsetS } : {}),
  });
  const table = pairRecordings(ref, dut, { offsetSeconds: estimate.offsetSeconds, intervalS: config.intervalS });
  return {
    table,
    laps: segmentsFromLaps(ref),
    facts: {
      offsetS: estimate.offsetSeconds,
      correlation: estimate.correlation,
      confidence: estimate.confidence,
      method: estimate.method,
      overlapS: table.overlapSeconds,
    },
  };
}
