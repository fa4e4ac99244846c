import { rollingMean } from './rolling-mean.js';
import type { Segment } from './segment.js';

/** Parameters of {@link detectSteadyBlocks}; reports show them beside the blocks. */
export interface SteadyBlockOptions {
  /** Smoothed power must stay within this percentage of the block's mean (default 5). */
  tolerancePct?: number;
  /** Shortest block kept, after trimming, seconds (default 60). */
  minDurationS?: number;
  /** Centred smoothing window applied before the test, seconds (default 6). */
  smoothS?: number;
  /** Cut from each end of a block so transitions and device smoothing stay out, seconds (default 3). */
  trimS?: number;
  /** Blocks whose mean is below this are coasting or rest, not steady effort, W (default 50). */
  minPowerW?: number;
  /** Excursions out of the band shorter than this do not end a block, seconds (default 5). */
  graceS?: number;
  /** Missing stretches longer than this end a block, seconds (default 5). */
  maxGapS?: number;
}

/** The defaults of {@link SteadyBlockOptions}, filled in. */
export const STEADY_BLOCK_DEFAULTS: Required<SteadyBlockOptions> = {
  tolerancePct: 5,
  minDurationS: 60,
  smoothS: 6,
  trimS: 3,
  minPowerW: 50,
  graceS: 5,
  maxGapS: 5,
};

/**
 * Finds steady-state blocks in the reference power on a regular grid: stretches where
 * the smoothed power stays within ±tolerancePct of the block's running mean (short
 * excursions forgiven), whose first and last quarters agree within half the tolerance
 * (so a slow ramp is not taken for a block), at least minDurationS long after trimming
 * trimS from both ends. One greedy pass: O(n).
 *
 * @param timeS the grid (seconds from the reference's first sample), regular spacing
 * @param powerW reference power on that grid, NaN = missing
 * @example
 * detectSteadyBlocks(paired.timeS, paired.columns.ref_power)
 * // [{ startS: 605, endS: 835, kind: 'steady', meanW: 250.3 }, ...]
 */
export function detectSteadyBlocks(timeS: Float64Array, powerW: Float64Array, options: SteadyBlockOptions = {}): Segment[] {
  const p = { ...STEADY_BLOCK_DEFAULTS, ...options };
  const n = timeS.length;
  if (n < 2) return [];
  const dt = timeS[1]! - timeS[0]!;
  const tol = p.tolerancePct / 100;
  const smoothN = Math.max(1, Math.round(p.smoothS / dt));
  const graceN = Math.max(0, Math.round(p.graceS / dt));
  const gapN = Math.max(0, Math.round(p.maxGapS / dt));
  const s = rollingMean(powerW, smoothN, { align: 'centred', minCount: Math.ceil(smoothN / 2) });
  const blocks: Segment[] = [];
  let i = 0;
  while (i < n) {
    const first = s[i]!;
    if (!(first >= p.minPowerW)) {
      i++;
      continue;
    }
    let sum = first;
    let count = 1;
    let lastGood = i;
    for (let k = i + 1; k < n; k++) {
      const v = s[k]!;
      if (!Number.isFinite(v)) {
        if (k - lastGood > gapN) break;
        continue;
      }
      const mean = sum / count;
      if (Math.abs(v - mean) > tol * mean) {
        if (k - lastGood > graceN) break;
        continue;
      }
      sum += v;
      count++;
      lastGood = k;
    }
    const block = trimmedBlock(timeS, powerW, s, i, lastGood, dt, p, tol);
    if (block) blocks.push(block);
    i = lastGood + 1;
  }
  return blocks;
}

function trimmedBlock(
  timeS: Float64Array,
  powerW: Float64Array,
  smooth: Float64Array,
  from: number,
  to: number,
  dt: number,
  p: Required<SteadyBlockOptions>,
  tol: number,
): Segment | undefined {
  const startS = timeS[from]! + p.trimS;
  const endS = timeS[to]! + dt - p.trimS;
  if (endS - startS < p.minDurationS - 1e-9) return undefined;
  const a = from + Math.round(p.trimS / dt);
  const b = to - Math.round(p.trimS / dt);
  const quarter = Math.max(1, Math.floor((b - a + 1) / 4));
  const head = finiteMean(smooth, a, a + quarter);
  const tail = finiteMean(smooth, b - quarter + 1, b + 1);
  const meanW = finiteMean(powerW, a, b + 1);
  if (!(meanW >= p.minPowerW) || Math.abs(tail - head) > (tol / 2) * meanW) return undefined;
  return { startS, endS, kind: 'steady', meanW };
}

function finiteMean(x: Float64Array, from: number, to: number): number {
  let sum = 0;
  let m = 0;
  for (let i = from; i < to; i++) {
    const v = x[i]!;
    if (Number.isFinite(v)) {
      sum += v;
      m++;
    }
  }
  return m > 0 ? sum / m : NaN;
}
