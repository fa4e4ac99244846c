import { olsFit } from './ols-fit.js';

/** Linear drift of a difference over time. */
export interface DriftFit {
  /** Slope of the difference in W per hour. */
  wPerHour: number;
  /** Difference at time 0 of the time axis, W. */
  interceptW: number;
  /** Number of samples used. */
  n: number;
  /** Standard error of the slope in W per hour (OLS; ignores autocorrelation, so optimistic). */
  seWPerHour: number;
}

/**
 * Drift of the difference test - reference over a ride: the OLS slope of `diffW`
 * against `timeS` (seconds), reported per hour. Samples where either is NaN (or the
 * mask is clear) are skipped. O(n).
 *
 * The standard error assumes independent residuals; 1-s differences are autocorrelated,
 * so use a block bootstrap ({@link blockBootstrapCi}) when the interval matters.
 *
 * @throws EngineError `length_mismatch`
 * @example
 * driftFit(timeS, diffW).wPerHour // -1.2 = the device loses 1.2 W per hour
 */
export function driftFit(timeS: ArrayLike<number>, diffW: ArrayLike<number>, mask?: Uint8Array): DriftFit {
  const fit = olsFit(timeS, diffW, mask);
  return { wPerHour: fit.slope * 3600, interceptW: fit.intercept, n: fit.n, seWPerHour: fit.slopeSe * 3600 };
}
