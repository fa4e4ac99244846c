import { centredSums, type CentredSums } from './centred-sums.js';

/** Options of {@link demingFit}. */
export interface DemingOptions {
  /**
   * Ratio of the measurement-error variances, var(error of x) / var(error of y), with x
   * the reference and y the device under test; default 1 (orthogonal regression). This is
   * the convention of Linnet (1990) and of R's mcr (`error.ratio`); Wikipedia's delta is its
   * inverse. 0 gives OLS of y on x; 1.21 means the reference's errors are 1.1x the device's SD.
   */
  errorRatio?: number;
  /** Only samples with a non-zero entry are used. */
  mask?: Uint8Array;
}

/** Deming regression line y = intercept + slope x. */
export interface DemingFit {
  /** Number of pairs used. */
  n: number;
  slope: number;
  intercept: number;
  /** The error-variance ratio used, var(error of x) / var(error of y). */
  errorRatio: number;
}

/**
 * Deming regression of `y` (device under test) on `x` (reference), allowing for
 * measurement error in both, over the pairs where both are finite (and the mask is set).
 * Closed form of Linnet (1990, Stat Med 9:1463) on corrected two-pass centred sums. O(n).
 *
 * To use an error ratio estimated from the data as var(y)/var(x) (the "ratio of
 * sample variances" variant), pass `errorRatio: syy / sxx` computed from {@link summary}.
 * Degenerate input (n < 2, Sxy = 0, constant column) gives NaN slope and intercept.
 *
 * @throws EngineError `length_mismatch`
 * @example
 * demingFit(referenceW, deviceW, { errorRatio: 0.25 }) // reference SD half the device's
 */
export function demingFit(x: ArrayLike<number>, y: ArrayLike<number>, options: DemingOptions = {}): DemingFit {
  const errorRatio = options.errorRatio ?? 1;
  const sums = centredSums(x, y, options.mask);
  const slope = demingSlope(sums, errorRatio);
  return { n: sums.n, slope, intercept: sums.meanY - slope * sums.meanX, errorRatio };
}

/**
 * Slope of a Deming fit from centred sums: the positive-branch root of
 * lambda Sxy b^2 + (Sxx - lambda Syy) b - Sxy = 0, written in whichever of its two
 * algebraically equal forms avoids cancellation.
 */
export function demingSlope(sums: Pick<CentredSums, 'n' | 'sxx' | 'syy' | 'sxy'>, errorRatio: number): number {
  const { n, sxx, syy, sxy } = sums;
  if (n < 2 || !(errorRatio >= 0) || !Number.isFinite(errorRatio) || sxy === 0 || !Number.isFinite(sxy)) return NaN;
  const u = errorRatio * syy - sxx;
  const root = Math.sqrt(u * u + 4 * errorRatio * sxy * sxy);
  return u >= 0 ? (u + root) / (2 * errorRatio * sxy) : (2 * sxy) / (root - u);
}
