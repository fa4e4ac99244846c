import { assertSameLength } from './paired.js';
import { studentTQuantile } from './student-t.js';

/** Options of {@link blandAltman}. */
export interface BlandAltmanOptions {
  /** Only samples with a non-zero entry are used. */
  mask?: Uint8Array;
  /** Width of the limits in SDs of the differences; default 1.96 (the 1986 paper used 2). */
  multiplier?: number;
}

/** Agreement of a device under test with a reference (differences test - reference, in W for power). */
export interface BlandAltmanResult {
  /** Number of pairs used. */
  n: number;
  /** Mean difference test - reference. */
  biasW: number;
  /** SD (n - 1) of the differences. */
  sdW: number;
  /** bias - multiplier * sd. */
  loaLowW: number;
  /** bias + multiplier * sd. */
  loaHighW: number;
  /** Standard error of the bias, sd / sqrt(n). */
  seBias: number;
  /** Standard error of either limit, sqrt(3 sd^2 / n) (Bland & Altman 1986). */
  seLoa: number;
  /** 95% confidence interval of the bias, bias +/- t(0.975, n-1) seBias. */
  biasCi: [number, number];
  /** 95% confidence interval of the lower limit, loaLow +/- t(0.975, n-1) seLoa. */
  loaLowCi: [number, number];
  /** 95% confidence interval of the upper limit. */
  loaHighCi: [number, number];
}

/**
 * Bland-Altman agreement of `test` against `reference` over the pairs where both are
 * finite (and the mask is set): bias, limits of agreement and their 95% confidence
 * intervals as in Bland JM, Altman DG, The Lancet 1986;327:307-310 (SE of a limit =
 * sqrt(3 s^2 / n), t with n - 1 degrees of freedom). The differences are summarised with
 * the corrected two-pass algorithm. O(n). n < 2 gives NaN for everything but n and bias.
 *
 * @throws EngineError `length_mismatch`
 * @example
 * blandAltman(devicePowerW, referencePowerW, { mask: steady }).biasW
 */
export function blandAltman(
  test: ArrayLike<number>,
  reference: ArrayLike<number>,
  options: BlandAltmanOptions = {},
): BlandAltmanResult {
  const { mask, multiplier = 1.96 } = options;
  assertSameLength(test, reference, mask);
  const len = test.length;
  let n = 0;
  let sum = 0;
  for (let i = 0; i < len; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const d = test[i]! - reference[i]!;
    if (!Number.isFinite(d)) continue;
    n++;
    sum += d;
  }
  let bias = n > 0 ? sum / n : NaN;
  let e1 = 0;
  let e2 = 0;
  for (let i = 0; i < len; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const d = test[i]! - reference[i]!;
    if (!Number.isFinite(d)) continue;
    const e = d - bias;
    e1 += e;
    e2 += e * e;
  }
  if (n > 0) bias += e1 / n;
  const sd = n < 2 ? NaN : Math.sqrt(Math.max(0, e2 - (e1 * e1) / n) / (n - 1));
  const loaLow = bias - multiplier * sd;
  const loaHigh = bias + multiplier * sd;
  const seBias = sd / Math.sqrt(n);
  const seLoa = Math.sqrt((3 * sd * sd) / n);
  const t = n < 2 ? NaN : studentTQuantile(0.975, n - 1);
  return {
    n,
    biasW: bias,
    sdW: sd,
    loaLowW: loaLow,
    loaHighW: loaHigh,
    seBias,
    seLoa,
    biasCi: [bias - t * seBias, bias + t * seBias],
    loaLowCi: [loaLow - t * seLoa, loaLow + t * seLoa],
    loaHighCi: [loaHigh - t * seLoa, loaHigh + t * seLoa],
  };
}
