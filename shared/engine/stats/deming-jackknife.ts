import { centredSums } from './centred-sums.js';
import { demingSlope, type DemingOptions } from './deming-fit.js';
import { studentTQuantile } from './student-t.js';

/** Options of {@link demingJackknife}. */
export interface DemingJackknifeOptions extends DemingOptions {
  /** Confidence level of the intervals; default 0.95. */
  level?: number;
}

/** Deming fit with leave-one-out jackknife standard errors and t intervals. */
export interface DemingJackknife {
  n: number;
  slope: number;
  intercept: number;
  errorRatio: number;
  slopeSe: number;
  interceptSe: number;
  slopeCi: [number, number];
  interceptCi: [number, number];
}

/**
 * Deming regression with jackknife confidence intervals as in Linnet (1990) and R's mcr:
 * pseudo-values PV_i = n est - (n - 1) est_(-i), SE = sd(PV)/sqrt(n), interval
 * est +/- t(1 - alpha/2, n - 2) SE around the full-sample estimate.
 *
 * The n leave-one-out fits downdate the centred sums in O(1) each
 * (Sxx_(-i) = Sxx - n/(n-1) (x_i - mean x)^2, likewise Syy and Sxy), so the whole
 * jackknife is O(n), not O(n^2). Needs n >= 3.
 *
 * @throws EngineError `length_mismatch`
 * @example
 * demingJackknife(referenceW, deviceW).slopeCi // [0.97, 1.01]
 */
export function demingJackknife(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  options: DemingJackknifeOptions = {},
): DemingJackknife {
  const { mask, level = 0.95 } = options;
  const errorRatio = options.errorRatio ?? 1;
  const sums = centredSums(x, y, mask);
  const { n, meanX, meanY, sxx, syy, sxy } = sums;
  const slope = demingSlope(sums, errorRatio);
  const intercept = meanY - slope * meanX;
  if (n < 3 || !Number.isFinite(slope)) {
    return { n, slope, intercept, errorRatio, slopeSe: NaN, interceptSe: NaN, slopeCi: [NaN, NaN], interceptCi: [NaN, NaN] };
  }

  const f = n / (n - 1);
  // Pseudo-values are kept (n doubles each) because their SD takes two passes.
  const pvSlope = new Float64Array(n);
  const pvIntercept = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < x.length; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi) || !Number.isFinite(yi)) continue;
    const ex = xi - meanX;
    const ey = yi - meanY;
    const b = demingSlope({ n: n - 1, sxx: sxx - f * ex * ex, syy: syy - f * ey * ey, sxy: sxy - f * ex * ey }, errorRatio);
    const a = meanY - ey / (n - 1) - b * (meanX - ex / (n - 1));
    pvSlope[k] = n * slope - (n - 1) * b;
    pvIntercept[k] = n * intercept - (n - 1) * a;
    k++;
  }
  const slopeSe = sampleSd(pvSlope) / Math.sqrt(n);
  const interceptSe = sampleSd(pvIntercept) / Math.sqrt(n);
  const t = studentTQuantile(1 - (1 - level) / 2, n - 2);
  return {
    n,
    slope,
    intercept,
    errorRatio,
    slopeSe,
    interceptSe,
    slopeCi: [slope - t * slopeSe, slope + t * slopeSe],
    interceptCi: [intercept - t * interceptSe, intercept + t * interceptSe],
  };
}

function sampleSd(v: Float64Array): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) m += v[i]!;
  m /= v.length;
  let d = 0;
  let d2 = 0;
  for (let i = 0; i < v.length; i++) {
    const e = v[i]! - m;
    d += e;
    d2 += e * e;
  }
  return Math.sqrt(Math.max(0, d2 - (d * d) / v.length) / (v.length - 1));
}
