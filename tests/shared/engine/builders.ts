import type { Recording, RecordingColumns, RecordingEvent } from '../../../shared/recording/recording.js';

/** Overrides for {@link recordingOf}. */
export interface RecordingParts {
  power: ArrayLike<number>;
  time?: ArrayLike<number>;
  startMs?: number;
  columns?: RecordingColumns;
  events?: RecordingEvent[];
  fileName?: string;
  sampleIntervalS?: number;
}

/** A small recording from inline numbers: 1 s samples from 0 unless `time` is given. */
export function recordingOf(parts: RecordingParts): Recording {
  const power = Float64Array.from(parts.power);
  const time = parts.time ? Float64Array.from(parts.time) : Float64Array.from(power, (_, i) => i);
  const n = time.length;
  return {
    meta: {
      fileName: parts.fileName ?? 'inline.fit',
      format: 'fit',
      device: {},
      startMs: parts.startMs ?? NaN,
      sampleIntervalS: parts.sampleIntervalS ?? (n > 1 ? (time[n - 1]! - time[0]!) / (n - 1) : 1),
      totalS: n > 0 ? time[n - 1]! - time[0]! : 0,
      pausedS: 0,
      balanceSide: 'none',
      dropouts: power.filter(Number.isNaN).length,
    },
    time,
    columns: { power, ...parts.columns },
    events: parts.events ?? [],
    warnings: [],
  };
}
