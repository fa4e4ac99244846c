import { assertSameLength } from './paired.js';

/** Least-squares line through the origin, y = slope x. */
export interface OriginFit {
  /** Number of pairs used. */
  n: number;
  slope: number;
  /** Standard error of the slope. */
  slopeSe: number;
  /** sqrt(RSS / (n - 1)). */
  residualSd: number;
  /** Uncentred R^2 = 1 - RSS / sum(y^2), the form NIST StRD certifies for no-intercept models. */
  r2Uncentred: number;
}

/**
 * Least-squares line through the origin of `y` on `x` (a pure gain: device = gain *
 * reference) over the pairs where both are finite (and the mask is set). O(n), two passes;
 * RSS is summed from the residuals. Degenerate input (all x zero, n < 1) gives NaN;
 * n < 2 gives NaN standard error and residual SD.
 *
 * @throws EngineError `length_mismatch`
 * @example
 * originFit(referenceW, deviceW).slope // 1.02 = device reads 2% high
 */
export function originFit(x: ArrayLike<number>, y: ArrayLike<number>, mask?: Uint8Array): OriginFit {
  assertSameLength(x, y, mask);
  let n = 0;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = 0; i < x.length; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi) || !Number.isFinite(yi)) continue;
    n++;
    sxx += xi * xi;
    sxy += xi * yi;
    syy += yi * yi;
  }
  if (n < 1 || !(sxx > 0)) return { n, slope: NaN, slopeSe: NaN, residualSd: NaN, r2Uncentred: NaN };
  const slope = sxy / sxx;
  let rss = 0;
  for (let i = 0; i < x.length; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi) || !Number.isFinite(yi)) continue;
    const e = yi - slope * xi;
    rss += e * e;
  }
  const residualSd = n > 1 ? Math.sqrt(rss / (n - 1)) : NaN;
  return { n, slope, slopeSe: residualSd / Math.sqrt(sxx), residualSd, r2Uncentred: syy > 0 ? 1 - rss / syy : NaN };
}
