import { EngineError } from '../errors.js';
import type { Segment } from './segment.js';

/**
 * Segments the analyst marked by hand, as [startS, endS) in seconds from the reference's
 * first sample, sorted by start.
 *
 * @throws EngineError `bad_range` when a range is empty, reversed or not finite.
 * @example
 * segmentsFromRanges([{ startS: 600, endS: 840, label: '250 W big ring' }])
 */
export function segmentsFromRanges(ranges: readonly { startS: number; endS: number; label?: string }[]): Segment[] {
  return ranges
    .map((r) => {
      if (!Number.isFinite(r.startS) || !Number.isFinite(r.endS) || r.endS <= r.startS) {
        throw new EngineError('bad_range', `section ${r.startS}-${r.endS} s is empty or reversed; give start < end in seconds`);
      }
      const segment: Segment = { startS: r.startS, endS: r.endS, kind: 'manual' };
      if (r.label !== undefined) segment.label = r.label;
      return segment;
    })
    .sort((a, b) => a.startS - b.startS);
}
