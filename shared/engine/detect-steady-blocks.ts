import { rollingMean } from './rolling-mean.js';
import { olsFit } from './stats/index.js';
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
  /** Excursions out of the band shorter than this do not end a block, seconds (default 10). */
  graceS?: number;
  /** Missing stretches longer than this (a pause, a long dropout) end a block, seconds (default 20). */
  maxGapS?: number;
}

/** The defaults of {@link SteadyBlockOptions}, filled in. */
export const STEADY_BLOCK_DEFAULTS: Required<SteadyBlockOptions> = {
  tolerancePct: 5,
  minDurationS: 60,
  smoothS: 6,
  trimS: 3,
  minPowerW: 50,
  graceS: 10,
  maxGapS: 20,
};

/**
 * Finds steady-state blocks in the reference power on a regular grid: stretches where
 * the smoothed power stays within ±tolerancePct of the block's running mean (short
 * excursions and dropouts forgiven, neighbouring stretches at the same level joined across
 * a longer excursion), whose linear trend over the block stays within the
 * tolerance (so a slow ramp is not taken for a block), at least minDurationS long after
 * trimming trimS from both ends. One greedy pass: O(n).
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
  // Pass 1: greedy runs inside the band. Pass 2: join neighbouring runs at the same
  // level that a longer excursion (a rider's surge) split. Pass 3: trim and keep.
  const runs: { from: number; to: number; mean: number }[] = [];
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
    const run = { from: i, to: lastGood, mean: sum / count };
    const last = runs[runs.length - 1];
    if (last !== undefined && run.from - last.to <= 2 * graceN + 1 && Math.abs(run.mean - last.mean) <= tol * last.mean) {
      const a = last.to - last.from + 1;
      const b = run.to - run.from + 1;
      last.mean = (last.mean * a + run.mean * b) / (a + b);
      last.to = run.to;
    } else {
      runs.push(run);
    }
    i = lastGood + 1;
  }
  const blocks: Segment[] = [];
  for (const run of runs) {
    const block = trimmedBlock(timeS, powerW, s, run.from, run.to, dt, p, tol);
    if (block) blocks.push(block);
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
  const meanW = finiteMean(powerW, a, b + 1);
  const trendW = olsFit(timeS.subarray(a, b + 1), smooth.subarray(a, b + 1)).slope * (endS - startS);
  if (!(meanW >= p.minPowerW) || Math.abs(trendW) > 2 * tol * meanW) return undefined;
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
