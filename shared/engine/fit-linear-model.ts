/** Least-squares fit of y on several regressors. */
export interface LinearModelFit {
  /** Rows used (all regressors and y finite, mask set). */
  n: number;
  /** One coefficient per regressor, in order; NaN when the design is singular. */
  coefficients: number[];
  /** Standard errors of the coefficients (independent residuals assumed, so optimistic for 1-s data). */
  standardErrors: number[];
  /** sqrt(RSS / (n - p)). */
  residualSd: number;
}

/**
 * Multiple linear regression y = sum_j b_j x_j (add a column of ones for an intercept)
 * by the normal equations, solved with Gaussian elimination and partial pivoting. Meant
 * for a handful of regressors over many rows: O(n p^2 + p^3).
 *
 * @example
 * // test = gain_50 * ref * [on 50T] + gain_34 * ref * [on 34T] + drift * hours
 * fitLinearModel([refOn50, refOn34, hours], test).coefficients
 */
export function fitLinearModel(regressors: readonly Float64Array[], y: Float64Array, mask?: Uint8Array): LinearModelFit {
  const p = regressors.length;
  const xtx = Array.from({ length: p }, () => new Float64Array(p));
  const xty = new Float64Array(p);
  const row = new Float64Array(p);
  let n = 0;
  outer: for (let i = 0; i < y.length; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    const yi = y[i]!;
    if (!Number.isFinite(yi)) continue;
    for (let j = 0; j < p; j++) {
      const v = regressors[j]![i]!;
      if (!Number.isFinite(v)) continue outer;
      row[j] = v;
    }
    n++;
    for (let j = 0; j < p; j++) {
      xty[j] += row[j]! * yi;
      for (let k = j; k < p; k++) xtx[j]![k] += row[j]! * row[k]!;
    }
  }
  for (let j = 0; j < p; j++) for (let k = 0; k < j; k++) xtx[j]![k] = xtx[k]![j]!;
  const inverse = invert(xtx);
  const nan = (): number[] => new Array<number>(p).fill(NaN);
  if (inverse === undefined || n <= p) return { n, coefficients: nan(), standardErrors: nan(), residualSd: NaN };
  const coefficients = Array.from({ length: p }, (_, j) => inverse[j]!.reduce((s, v, k) => s + v * xty[k]!, 0));
  let rss = 0;
  outer2: for (let i = 0; i < y.length; i++) {
    if (mask !== undefined && mask[i] === 0) continue;
    let fitted = 0;
    for (let j = 0; j < p; j++) {
      const v = regressors[j]![i]!;
      if (!Number.isFinite(v)) continue outer2;
      fitted += coefficients[j]! * v;
    }
    const r = y[i]! - fitted;
    if (Number.isFinite(r)) rss += r * r;
  }
  const residualSd = Math.sqrt(rss / (n - p));
  const standardErrors = Array.from({ length: p }, (_, j) => residualSd * Math.sqrt(inverse[j]![j]!));
  return { n, coefficients, standardErrors, residualSd };
}

/** Inverse of a small symmetric matrix by Gauss-Jordan with partial pivoting; undefined when singular. */
function invert(a: Float64Array[]): Float64Array[] | undefined {
  const p = a.length;
  const m = a.map((r) => r.slice());
  const inv = Array.from({ length: p }, (_, j) => Float64Array.from({ length: p }, (_, k) => (j === k ? 1 : 0)));
  const scale = Math.max(1e-300, ...m.map((r, j) => Math.abs(r[j]!)));
  for (let col = 0; col < p; col++) {
    let pivot = col;
    for (let r = col + 1; r < p; r++) if (Math.abs(m[r]![col]!) > Math.abs(m[pivot]![col]!)) pivot = r;
    if (Math.abs(m[pivot]![col]!) <= 1e-12 * scale) return undefined;
    [m[col], m[pivot]] = [m[pivot]!, m[col]!];
    [inv[col], inv[pivot]] = [inv[pivot]!, inv[col]!];
    const d = m[col]![col]!;
    for (let k = 0; k < p; k++) {
      m[col]![k] = m[col]![k]! / d;
      inv[col]![k] = inv[col]![k]! / d;
    }
    for (let r = 0; r < p; r++) {
      if (r === col) continue;
      const f = m[r]![col]!;
      if (f === 0) continue;
      for (let k = 0; k < p; k++) {
        m[r]![k] = m[r]![k]! - f * m[col]![k]!;
        inv[r]![k] = inv[r]![k]! - f * inv[col]![k]!;
      }
    }
  }
  return inv;
}
