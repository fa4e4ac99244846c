import { drawCircularBlocks, percentileInterval, planBootstrap, type BlockBootstrapOptions, type BootstrapCi } from './circular-blocks.js';
import { optimalBlockLength } from './optimal-block-length.js';
import { pairedIndices } from './paired.js';
import { sumRatioBootstrapCi } from './sum-ratio-bootstrap.js';

export type { BlockBootstrapOptions, BootstrapCi } from './circular-blocks.js';

/**
 * Circular block bootstrap (Politis & Romano 1992) percentile interval for a statistic
 * of a time series with `n` samples. Consecutive 1-s power samples are strongly
 * autocorrelated; resampling single samples (block length 1) treats them as independent
 * and gives intervals far too narrow, while blocks keep the short-range dependence.
 *
 * Each replicate joins blocks of `blockLength` consecutive positions from random starts,
 * wrapping at the end, until `n` positions are drawn, and calls `statistic(indices)`.
 * The indices buffer is reused between calls: read it, do not keep it. Percentiles use
 * linear interpolation between order statistics (R type 7). Seeded: the same inputs and
 * seed give the same interval. Cost O(replicates x n) plus the statistic.
 *
 * @example
 * const ci = blockBootstrapCi(diff.length, (ix) => meanAt(diff, ix), { blockLength: 30 });
 */
export function blockBootstrapCi(
  n: number,
  statistic: (indices: Int32Array) => number,
  options: BlockBootstrapOptions = {},
): BootstrapCi {
  const { blockLength, replicates, level, random } = planBootstrap(n, options);
  const indices = new Int32Array(n);
  for (let i = 0; i < n; i++) indices[i] = i;
  const estimate = n > 0 ? statistic(indices) : NaN;
  if (n === 0) return { estimate, low: NaN, high: NaN, blockLength, replicates: 0 };

  let pos = 0;
  const fill = (start: number, length: number): void => {
    let j = start;
    for (const end = pos + length; pos < end; ) {
      indices[pos++] = j;
      j = j + 1 === n ? 0 : j + 1;
    }
  };
  const values = new Float64Array(replicates);
  let valid = 0;
  for (let r = 0; r < replicates; r++) {
    pos = 0;
    drawCircularBlocks(n, blockLength, random, fill);
    const v = statistic(indices);
    if (Number.isFinite(v)) values[valid++] = v;
  }
  return { estimate, ...percentileInterval(values, valid, level), blockLength, replicates: valid };
}

/**
 * Ratio of means test/reference (1.02 = the device reads 2% high) over the pairs where
 * both are finite (and the mask is set), with a circular block bootstrap interval. The
 * default block length comes from {@link optimalBlockLength} of the ratio's influence
 * series test - ratio * reference. A ratio of sums, so the replicates run on block sums
 * ({@link sumRatioBootstrapCi}): O(n + replicates x n / blockLength).
 *
 * @throws EngineError `length_mismatch`
 * @example
 * ratioCi(deviceW, referenceW, steady) // { estimate: 1.012, low: 1.006, high: 1.018, ... }
 */
export function ratioCi(
  test: ArrayLike<number>,
  reference: ArrayLike<number>,
  mask?: Uint8Array,
  options: BlockBootstrapOptions = {},
): BootstrapCi {
  const pairs = pairedIndices(test, reference, mask);
  const n = pairs.length;
  const t = new Float64Array(n);
  const r = new Float64Array(n);
  let st = 0;
  let sr = 0;
  for (let k = 0; k < n; k++) {
    t[k] = test[pairs[k]!]!;
    r[k] = reference[pairs[k]!]!;
    st += t[k]!;
    sr += r[k]!;
  }
  return ratioOfSumsCi(t, r, st / sr, options);
}

/**
 * Gain of the device through the origin (slope of test on reference with no offset,
 * sum(t r)/sum(r^2)) with a circular block bootstrap interval; block length by default
 * from {@link optimalBlockLength} of the influence series r (t - gain r). A ratio of
 * sums, resampled on block sums ({@link sumRatioBootstrapCi}).
 *
 * @throws EngineError `length_mismatch`
 * @example
 * gainCi(deviceW, referenceW) // { estimate: 0.985, ... } = reads 1.5% low
 */
export function gainCi(
  test: ArrayLike<number>,
  reference: ArrayLike<number>,
  mask?: Uint8Array,
  options: BlockBootstrapOptions = {},
): BootstrapCi {
  const pairs = pairedIndices(test, reference, mask);
  const n = pairs.length;
  const tr = new Float64Array(n);
  const rr = new Float64Array(n);
  let str = 0;
  let srr = 0;
  for (let k = 0; k < n; k++) {
    const tk = test[pairs[k]!]!;
    const rk = reference[pairs[k]!]!;
    tr[k] = tk * rk;
    rr[k] = rk * rk;
    str += tr[k]!;
    srr += rr[k]!;
  }
  return ratioOfSumsCi(tr, rr, str / srr, options);
}

/**
 * Interval of sum(num)/sum(den) by resampling block sums; without a block length, one is
 * chosen from the influence series num - estimate * den.
 */
function ratioOfSumsCi(num: Float64Array, den: Float64Array, estimate: number, options: BlockBootstrapOptions): BootstrapCi {
  let blockLength = options.blockLength;
  if (blockLength === undefined && num.length > 0) {
    const influence = new Float64Array(num.length);
    for (let k = 0; k < num.length; k++) influence[k] = num[k]! - estimate * den[k]!;
    blockLength = optimalBlockLength(influence);
  }
  return sumRatioBootstrapCi(num, den, { ...options, blockLength });
}
