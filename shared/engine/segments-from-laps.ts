import type { LapEvent, Recording } from '../recording/recording.js';
import type { Segment } from './segment.js';

/**
 * The laps a recording holds, as segments on the reference's time axis. Pass the shift
 * used in pairing when the laps come from a test recording (reference time = test time
 * - shiftS). Laps shorter than minDurationS are left out.
 *
 * @param shiftS test time minus reference time, seconds (default 0: the reference's own laps)
 * @param minDurationS default 1
 * @example
 * segmentsFromLaps(reference) // [{ startS: 0, endS: 600, kind: 'lap', label: 'Lap 1' }, ...]
 */
export function segmentsFromLaps(recording: Recording, shiftS = 0, minDurationS = 1): Segment[] {
  return recording.events
    .filter((e): e is LapEvent => e.kind === 'lap')
    .sort((a, b) => a.startS - b.startS)
    .map((lap, i) => ({ startS: lap.startS - shiftS, endS: lap.endS - shiftS, kind: 'lap' as const, label: `Lap ${i + 1}` }))
    .filter((s) => s.endS - s.startS >= minDurationS);
}
