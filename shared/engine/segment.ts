/** Where a section of the ride came from. */
export type SegmentKind = 'steady' | 'lap' | 'manual';

/**
 * A section of the ride, in seconds from the reference's first sample; it covers
 * [startS, endS).
 */
export interface Segment {
  startS: number;
  endS: number;
  kind: SegmentKind;
  /** Mean reference power over the section, W, when known. */
  meanW?: number;
  label?: string;
}
