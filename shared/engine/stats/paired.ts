import { EngineError } from '../../errors.js';

/**
 * Indices where both `a[i]` and `b[i]` are finite (and `mask[i]` is non-zero when a
 * mask is given): the samples two columns can be compared on. O(n).
 *
 * @throws EngineError `length_mismatch` when the arrays (or the mask) differ in length.
 * @example
 * pairedIndices([1, NaN, 3], [4, 5, 6]) // Int32Array [0, 2]
 */
export function pairedIndices(a: ArrayLike<number>, b: ArrayLike<number>, mask?: Uint8Array): Int32Array {
  assertSameLength(a, b, mask);
  const len = a.length;
  const out = new Int32Array(len);
  let k = 0;
  for (let i = 0; i < len; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    if (Number.isFinite(a[i]!) && Number.isFinite(b[i]!)) out[k++] = i;
  }
  return out.slice(0, k);
}

/**
 * Throws when two paired columns (and an optional mask) differ in length.
 *
 * @throws EngineError `length_mismatch`
 */
export function assertSameLength(a: ArrayLike<number>, b: ArrayLike<number>, mask?: Uint8Array): void {
  if (a.length !== b.length) {
    throw new EngineError('length_mismatch', `paired columns differ in length: ${a.length} and ${b.length} samples`);
  }
  if (mask !== undefined && mask.length !== a.length) {
    throw new EngineError('length_mismatch', `mask has ${mask.length} entries for columns of ${a.length} samples`);
  }
}
