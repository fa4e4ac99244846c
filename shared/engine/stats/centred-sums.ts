import { assertSameLength } from './paired.js';

/** Means and centred sums of squares/products of the usable pairs of two columns. */
export interface CentredSums {
  n: number;
  meanX: number;
  meanY: number;
  /** Sum of (x - meanX)^2. */
  sxx: number;
  /** Sum of (y - meanY)^2. */
  syy: number;
  /** Sum of (x - meanX)(y - meanY). */
  sxy: number;
}

/**
 * Means and centred sums over the pairs where x and y are finite (and mask non-zero).
 * Corrected two-pass algorithm: the second pass also measures the rounding error of
 * the means and removes it, which is what keeps NIST Norris at 11+ digits. O(n).
 *
 * @throws EngineError `length_mismatch`
 */
export function centredSums(x: ArrayLike<number>, y: ArrayLike<number>, mask?: Uint8Array): CentredSums {
  assertSameLength(x, y, mask);
  const len = x.length;
  let n = 0;
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < len; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi) || !Number.isFinite(yi)) continue;
    n++;
    sx += xi;
    sy += yi;
  }
  if (n === 0) return { n: 0, meanX: NaN, meanY: NaN, sxx: NaN, syy: NaN, sxy: NaN };
  const mx = sx / n;
  const my = sy / n;
  let dx = 0;
  let dy = 0;
  let dxx = 0;
  let dyy = 0;
  let dxy = 0;
  for (let i = 0; i < len; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const xi = x[i]!;
    const yi = y[i]!;
    if (!Number.isFinite(xi) || !Number.isFinite(yi)) continue;
    const ex = xi - mx;
    const ey = yi - my;
    dx += ex;
    dy += ey;
    dxx += ex * ex;
    dyy += ey * ey;
    dxy += ex * ey;
  }
  return {
    n,
    meanX: mx + dx / n,
    meanY: my + dy / n,
    sxx: Math.max(0, dxx - (dx * dx) / n),
    syy: Math.max(0, dyy - (dy * dy) / n),
    sxy: dxy - (dx * dy) / n,
  };
}
