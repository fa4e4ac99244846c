import { normalDensity, normalSplit } from './normal-cdf.js';

const A = [-39.69683028665376, 220.9460984245205, -275.9285104469687, 138.357751867269, -30.66479806614716, 2.506628277459239];
const B = [-54.47609879822406, 161.5858368580409, -155.6989798598866, 66.80131188771972, -13.28068155288572];
const C = [-0.007784894002430293, -0.3223964580411365, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
const D = [0.007784695709041462, 0.3224671290700398, 2.445134137142996, 3.754408661907416];
const P_LOW = 0.02425;

/**
 * Standard normal quantile: Acklam's rational approximation (relative error 1.15e-9)
 * refined by Newton steps on the tail or central probability (whichever is smaller, so
 * neither end loses digits); ~1e-15 relative.
 *
 * @example
 * normalQuantile(0.975) // 1.959963984540054
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) return acklam(p);
  if (p === 0.5) return 0;
  // p - 0.5 is exact for p in [0.25, 1] (Sterbenz); below that the tail is p itself.
  const useCentral = p >= 0.25 && p <= 0.75;
  const target = useCentral ? Math.abs(p - 0.5) : Math.min(p, 1 - p);
  let z = Math.abs(acklam(p));
  for (let i = 0; i < 4; i++) {
    const split = normalSplit(z);
    const error = useCentral ? target - split.central : split.tail - target;
    const step = error / normalDensity(z);
    z += step;
    if (Math.abs(step) <= 1e-16 * z) break;
  }
  return p < 0.5 ? -z : z;
}

/** Acklam's rational approximation of the normal quantile (starting value). */
function acklam(p: number): number {
  if (!(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p < P_LOW) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((C[0]! * q + C[1]!) * q + C[2]!) * q + C[3]!) * q + C[4]!) * q + C[5]!) / ((((D[0]! * q + D[1]!) * q + D[2]!) * q + D[3]!) * q + 1);
  }
  if (p > 1 - P_LOW) return -acklam(1 - p);
  const q = p - 0.5;
  const r = q * q;
  return ((((((A[0]! * r + A[1]!) * r + A[2]!) * r + A[3]!) * r + A[4]!) * r + A[5]!) * q) / (((((B[0]! * r + B[1]!) * r + B[2]!) * r + B[3]!) * r + B[4]!) * r + 1);
}
