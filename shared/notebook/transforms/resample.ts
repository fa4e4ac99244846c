import { resample } from '../../engine/resample.js';
import type { NotebookTable } from '../cell-value.js';
import type { TransformConfig } from '../cell-config.js';
import { asRecording, type TransformInput } from './transform-input.js';

type ResampleConfig = Extract<TransformConfig, { op: 'resample' }>;

/** Puts one recording on a regular grid (gaps over maxGapS stay missing). */
export function resampleTransform(config: ResampleConfig, source: TransformInput): NotebookTable {
  const table = resample(asRecording(source, 'resample'), { intervalS: config.intervalS, maxGapS: config.maxGapS });
  return { table, facts: { intervalS: config.intervalS, maxGapS: config.maxGapS } };
}
