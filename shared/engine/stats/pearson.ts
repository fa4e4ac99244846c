import { centredSums } from './centred-sums.js';

/**
 * Pearson correlation of `x` and `y` over the pairs where both are finite (and the
 * mask is set), from corrected two-pass centred sums. NaN when either side is constant
 * or fewer than two pairs remain. O(n).
 *
 * @throws EngineError `length_mismatch`
 * @example
 * pearson(referenceW, deviceW) // 0.998
 */
export function pearson(x: ArrayLike<number>, y: ArrayLike<number>, mask?: Uint8Array): number {
  const { n, sxx, syy, sxy } = centredSums(x, y, mask);
  if (n < 2 || !(sxx > 0) || !(syy > 0)) return NaN;
  const r = sxy / Math.sqrt(sxx * syy);
  return Math.max(-1, Math.min(1, r));
}
