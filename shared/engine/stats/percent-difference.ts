/**
 * Percent difference of a device under test against the reference,
 * (test / reference - 1) * 100: +2 means the device reads 2% high.
 *
 * @example
 * percentDifference(90.40, 90.97) // -0.6266 (reads 0.63% low)
 */
export function percentDifference(test: number, reference: number): number {
  return (test / reference - 1) * 100;
}

/**
 * Arithmetic mean of several ratios test/reference (one per section, block or gear
 * state), skipping non-finite ones; the way testers pool section estimates. NaN if none.
 *
 * @example
 * meanOfRatios([0.8834, 0.8807, 0.8704, 0.8674]) // 0.87548 -> a 12.45% difference
 */
export function meanOfRatios(ratios: ArrayLike<number>): number {
  let n = 0;
  let sum = 0;
  for (let i = 0; i < ratios.length; i++) {
    const r = ratios[i]!;
    if (!Number.isFinite(r)) continue;
    n++;
    sum += r;
  }
  return n > 0 ? sum / n : NaN;
}

/**
 * Combined tolerance (percent) of comparing a device against a reference whose errors
 * are independent: the root sum of squares sqrt(device^2 + reference^2). This is the
 * band a difference has to leave before it says anything about the device alone
 * (2% and 1% give 2.24%). For the worst case, both errors aligned, see
 * {@link worstCaseTolerance}.
 *
 * @example
 * combinedTolerance(2, 1) // 2.2360679...
 */
export function combinedTolerance(devicePct: number, referencePct: number): number {
  return Math.hypot(devicePct, referencePct);
}

/**
 * Worst-case combined tolerance (percent): both devices off by their full stated
 * tolerance in opposite directions, device + reference (2% and 1% give 3%).
 *
 * @example
 * worstCaseTolerance(2, 1) // 3
 */
export function worstCaseTolerance(devicePct: number, referencePct: number): number {
  return Math.abs(devicePct) + Math.abs(referencePct);
}

/**
 * True when a percent difference lies inside +/- tolerance (inclusive).
 *
 * @example
 * withinTolerance(-0.63, 2) // true
 */
export function withinTolerance(differencePct: number, tolerancePct: number): boolean {
  return Math.abs(differencePct) <= tolerancePct;
}
