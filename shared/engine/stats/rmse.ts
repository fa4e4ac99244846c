import { assertSameLength } from './paired.js';

/**
 * Root mean square of test - reference over the pairs where both are finite (and the
 * mask is set); divisor n. NaN when no pair remains. O(n).
 *
 * @throws EngineError `length_mismatch`
 * @example
 * rmse([101, 99], [100, 100]) // 1
 */
export function rmse(test: ArrayLike<number>, reference: ArrayLike<number>, mask?: Uint8Array): number {
  assertSameLength(test, reference, mask);
  let n = 0;
  let ss = 0;
  for (let i = 0; i < test.length; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const d = test[i]! - reference[i]!;
    if (!Number.isFinite(d)) continue;
    n++;
    ss += d * d;
  }
  return n > 0 ? Math.sqrt(ss / n) : NaN;
}
