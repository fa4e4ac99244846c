import type { ColumnName, Recording } from '../recording/recording.js';
import { EngineError } from '../errors.js';
import { resampleColumn, type ResampleMode } from './resample-column.js';
import type { Table } from './table.js';

/** Options of {@link resample}. */
export interface ResampleOptions {
  /** Grid spacing, seconds (default 1). */
  intervalS?: number;
  /** Longest gap between finite samples that is bridged by interpolation, seconds (default 3). */
  maxGapS?: number;
  /** First grid time (in the output's frame, seconds); default: the first sample, rounded up to the grid. */
  startS?: number;
  /** Last grid time at most this, seconds; default: the last sample. */
  endS?: number;
  /**
   * Seconds added to a grid time to find the recording's own time (default 0): the grid
   * time t reads the recording at t + shiftS. Pairing passes the alignment here.
   */
  shiftS?: number;
}

/** Columns that hold a state (gear), read by holding the last value instead of interpolating. */
const STEP_COLUMNS = new Set<string>(['frontGear', 'frontGearTeeth', 'rearGear', 'rearGearTeeth']);

/**
 * Puts every column of a recording on a regular time grid: linear interpolation (or bin
 * means when the source is denser than the grid) for continuous columns, the last value
 * held for gear columns, NaN across gaps longer than `maxGapS`. O(n + m) per column.
 *
 * @throws EngineError `bad_interval` when intervalS is not a positive number.
 * @example
 * const table = resample(recording, { intervalS: 1, shiftS: 12 });
 * table.columns.power; // power at reference time t read from recording time t + 12
 */
export function resample(recording: Recording, options: ResampleOptions = {}): Table {
  const intervalS = options.intervalS ?? 1;
  const maxGapS = options.maxGapS ?? 3;
  const shiftS = options.shiftS ?? 0;
  if (!(intervalS > 0) || !Number.isFinite(intervalS)) {
    throw new EngineError('bad_interval', `resampling interval must be a positive number of seconds, got ${intervalS}`, {
      file: recording.meta.fileName,
    });
  }
  const time = recording.time;
  const n = time.length;
  const firstS = n > 0 ? time[0]! - shiftS : 0;
  const lastS = n > 0 ? time[n - 1]! - shiftS : -1;
  const startS = options.startS ?? Math.ceil(firstS / intervalS - 1e-9) * intervalS;
  const endS = options.endS ?? lastS;
  const count = n === 0 || endS < startS ? 0 : Math.floor((endS - startS) / intervalS + 1e-9) + 1;
  const timeS = new Float64Array(count);
  for (let k = 0; k < count; k++) timeS[k] = startS + k * intervalS;
  const columns: Record<string, Float64Array> = {};
  for (const [name, values] of Object.entries(recording.columns) as [ColumnName, Float64Array | undefined][]) {
    if (values === undefined) continue;
    const mode: ResampleMode = STEP_COLUMNS.has(name) ? 'step' : 'linear';
    columns[name] = resampleColumn(time, values, {
      startS: startS + shiftS,
      intervalS,
      count,
      maxGapS,
      mode,
      sourceIntervalS: recording.meta.sampleIntervalS,
    });
  }
  return { timeS, columns, meta: { intervalS, maxGapS, shiftS } };
}
