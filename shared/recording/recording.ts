import type { EngineWarning } from '../errors.js';

/**
 * Names of the sample columns a recording may carry. All share the recording's
 * time axis; a missing sample is NaN (a dropout is not zero power).
 */
export const COLUMN_NAMES = [
  'power', // W, total as the device reports it
  'leftPower', // W, derived from power and balance when the side is known
  'rightPower', // W
  'balance', // %, as the file gives it; see RecordingMeta.balanceSide
  'cadence', // rpm
  'speed', // m/s
  'heartRate', // bpm
  'leftTorqueEffectiveness', // %
  'rightTorqueEffectiveness', // %
  'leftPedalSmoothness', // %
  'rightPedalSmoothness', // %
  'frontGear', // chainring index (1 = smallest), step column
  'frontGearTeeth', // chainring teeth, step column
  'rearGear', // cog index (1 = largest), step column
  'rearGearTeeth', // cog teeth, step column
] as const;

export type ColumnName = (typeof COLUMN_NAMES)[number];

/** The columns of a recording; only those the file holds are present. */
export type RecordingColumns = Partial<Record<ColumnName, Float64Array>>;

/**
 * Whose share the balance column states: `right` (FIT bit 0x80 set), `left` (a CSV
 * that says "% left"), `unknown` (FIT bit clear: the side is not stated), or `none`
 * when the file has no balance.
 */
export type BalanceSide = 'left' | 'right' | 'unknown' | 'none';

/** Device identity as the file gives it (FIT file_id / device_info, or CSV mapping). */
export interface DeviceIdentity {
  manufacturer?: string;
  manufacturerId?: number;
  product?: string;
  productId?: number;
  serialNumber?: number;
  softwareVersion?: string;
  /** A label the user gave, e.g. "Reference spider". */
  label?: string;
}

export interface RecordingMeta {
  fileName: string;
  /** Hex sha256 of the original bytes, when the host computed it. */
  sha256?: string;
  format: 'fit' | 'csv';
  device: DeviceIdentity;
  /** Absolute time of the first sample, ms since the Unix epoch (UTC). NaN when the file has no absolute time. */
  startMs: number;
  /** Most common spacing between samples, seconds. */
  sampleIntervalS: number;
  /** Last minus first sample time, seconds. */
  totalS: number;
  /** Time spent with the timer stopped, seconds. */
  pausedS: number;
  balanceSide: BalanceSide;
  /** Number of samples where power is NaN. */
  dropouts: number;
}

export type GearState = { index: number; teeth: number };

export interface GearEvent {
  kind: 'gear';
  /** Seconds from the recording's first sample. */
  t: number;
  front?: GearState;
  rear?: GearState;
  /** The FIT event name it came from, e.g. front_gear_change. */
  source?: string;
}

export interface LapEvent {
  kind: 'lap';
  t: number;
  /** Lap start and end, seconds from the first sample. */
  startS: number;
  endS: number;
}

export interface TimerEvent {
  kind: 'timer_stop' | 'timer_start';
  t: number;
}

export type RecordingEvent = GearEvent | LapEvent | TimerEvent;

/**
 * One device's recording of a ride: metadata plus Float64Array columns on one time
 * axis (`time`, seconds from the first sample), and events.
 */
export interface Recording {
  meta: RecordingMeta;
  time: Float64Array;
  columns: RecordingColumns;
  events: RecordingEvent[];
  warnings: EngineWarning[];
}
