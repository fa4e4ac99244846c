/** Location and spread of one column. */
export interface Summary {
  /** Number of finite values used. */
  n: number;
  mean: number;
  /** Sample standard deviation (divisor n - 1); NaN when n < 2. */
  sd: number;
  min: number;
  max: number;
  /** Compensated (Neumaier) sum of the finite values. */
  sum: number;
}

/**
 * Count, mean, sample SD, extremes and sum of the finite values of `x`; NaN and
 * +/-Infinity count as missing and are skipped.
 *
 * The mean gets one correction pass and the SD uses the corrected two-pass formula
 * (Chan, Golub & LeVeque 1983) so values with a large common offset keep their digits
 * (NIST StRD NumAcc3: eight-digit values differing in the seventh). O(n), three passes.
 *
 * @example
 * summary(new Float64Array([200, 210, NaN, 190])) // { n: 3, mean: 200, sd: 10, min: 190, max: 210, sum: 600 }
 */
export function summary(x: ArrayLike<number>): Summary {
  const len = x.length;
  let n = 0;
  let sum = 0;
  let carry = 0;
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < len; i++) {
    const v = x[i]!;
    if (!Number.isFinite(v)) continue;
    n++;
    // Neumaier summation: the reported sum keeps the digits a plain loop loses.
    const t = sum + v;
    carry += Math.abs(sum) >= Math.abs(v) ? sum - t + v : v - t + sum;
    sum = t;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (n === 0) return { n: 0, mean: NaN, sd: NaN, min: NaN, max: NaN, sum: 0 };
  sum += carry;
  let mean = sum / n;
  let d = 0;
  let d2 = 0;
  for (let i = 0; i < len; i++) {
    const v = x[i]!;
    if (!Number.isFinite(v)) continue;
    const e = v - mean;
    d += e;
    d2 += e * e;
  }
  // d is the rounding error left in the mean; removing d^2/n is the two-pass correction.
  mean += d / n;
  const sd = n < 2 ? NaN : Math.sqrt(Math.max(0, d2 - (d * d) / n) / (n - 1));
  return { n, mean, sd, min, max, sum };
}
