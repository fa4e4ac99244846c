import type { Recording } from '../recording/recording.js';

/**
 * Converts a clock offset into the shift between the two recordings' own time axes:
 * the test's time (seconds from its first sample) that corresponds to reference time t
 * is `t + shift`.
 *
 * The offset is the test clock minus the reference clock: the test sample stamped
 * `c + offset` on the test's clock was taken at the moment the reference stamped `c`.
 * Clocks are the files' absolute times when both recordings have one (so head units
 * started at different moments line up by themselves), otherwise each recording's
 * time from its first sample.
 *
 * @example
 * // test started 30 s after the reference and its clock runs 4 s ahead:
 * shiftForOffset(reference, test, 4) // -26 (reference t = 100 s is test t = 74 s)
 */
export function shiftForOffset(reference: Recording, test: Recording, offsetSeconds: number): number {
  return clockStartS(reference, test) - clockStartS(test, reference) + offsetSeconds;
}

/** Clock time of a recording's time zero: its absolute start when both have one, else 0. */
function clockStartS(recording: Recording, other: Recording): number {
  const bothAbsolute = Number.isFinite(recording.meta.startMs) && Number.isFinite(other.meta.startMs);
  return bothAbsolute ? recording.meta.startMs / 1000 : 0;
}
