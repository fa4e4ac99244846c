import { centredSums } from './centred-sums.js';

/** Ordinary least squares line y = intercept + slope x. */
export interface OlsFit {
  /** Number of pairs used. */
  n: number;
  slope: number;
  intercept: number;
  /** Standard error of the slope. */
  slopeSe: number;
  /** Standard error of the intercept. */
  interceptSe: number;
  /** sqrt(RSS / (n - 2)). */
  residualSd: number;
  /** 1 - RSS / sum((y - mean y)^2). */
  r2: number;
}

/**
 * Least-squares line of `y` on `x` over the pairs where both are finite (and the mask
 * is set), by the centred closed form: slope = Sxy/Sxx with corrected two-pass sums and
 * the residual sum of squares from the residuals themselves (a third pass), which keeps
 * NIST StRD Norris to 12 digits. O(n).
 *
 * Degenerate input never throws: constant x (Sxx = 0) or n < 2 give NaN slope and
 * intercept; n < 3 gives NaN standard errors and residual SD.
 *
 * @throws EngineError `length_mismatch`
 * @example
 * olsFit(referenceW, deviceW).slope // scale of the device against the reference
 */
export function olsFit(x: ArrayLike<number>, y: ArrayLike<number>, mask?: Uint8Array): OlsFit {
  const { n, meanX, meanY, sxx, syy, sxy } = centredSums(x, y, mask);
  if (n < 2 || !(sxx > 0)) {
    return { n, slope: NaN, intercept: NaN, slopeSe: NaN, interceptSe: NaN, residualSd: NaN, r2: NaN };
  }
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  let rss = 0;
  for (let i = 0; i < x.length; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi) || !Number.isFinite(yi)) continue;
    const e = yi - meanY - slope * (xi - meanX);
    rss += e * e;
  }
  const residualSd = n > 2 ? Math.sqrt(rss / (n - 2)) : NaN;
  return {
    n,
    slope,
    intercept,
    slopeSe: residualSd / Math.sqrt(sxx),
    interceptSe: residualSd * Math.sqrt(1 / n + (meanX * meanX) / sxx),
    residualSd,
    r2: syy > 0 ? 1 - rss / syy : NaN,
  };
}
