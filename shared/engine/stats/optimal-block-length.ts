/** Flat-top lag window of Politis & Romano (1995). */
function flatTop(t: number): number {
  const a = Math.abs(t);
  if (a <= 0.5) return 1;
  if (a <= 1) return 2 * (1 - a);
  return 0;
}

/**
 * Block length for a circular block bootstrap of the mean of `x`, chosen from its
 * autocorrelation by the rule of Politis & White (2004, Econometric Reviews 23:53-70)
 * with the correction of Patton, Politis & White (2009, 28:372-375), as implemented in R's
 * np::b.star: find the lag after which K_n = max(5, ceil(log10 n)) autocorrelations in a
 * row are below 2 sqrt(log10(n)/n), then b = (2 G^2 / D)^(1/3) n^(1/3) with flat-top
 * weighted sums G and D = (4/3) g(0)^2; rounded up, within [1, min(3 sqrt(n), n/3)].
 *
 * Non-finite values are dropped first. Cost O(n sqrt(n)) (autocovariances up to lag
 * sqrt(n) + K_n); 1 for fewer than 8 values or a constant series.
 *
 * @example
 * optimalBlockLength(diffW) // 40 for 1-s power differences with slow wander
 */
export function optimalBlockLength(x: ArrayLike<number>): number {
  let n = 0;
  const values = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) {
    const v = x[i]!;
    if (Number.isFinite(v)) values[n++] = v;
  }
  if (n < 8) return 1;
  const data = values.subarray(0, n);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += data[i]!;
  mean /= n;
  for (let i = 0; i < n; i++) data[i]! -= mean;

  const kn = Math.max(5, Math.ceil(Math.log10(n)));
  const mMax = Math.min(n - 1, Math.ceil(Math.sqrt(n)) + kn);
  const bMax = Math.ceil(Math.min(3 * Math.sqrt(n), n / 3));
  const cov = new Float64Array(mMax + 1);
  for (let k = 0; k <= mMax; k++) {
    let s = 0;
    for (let i = 0; i + k < n; i++) s += data[i]! * data[i + k]!;
    cov[k] = s / n;
  }
  const c0 = cov[0]!;
  if (!(c0 > 0)) return 1;
  const critical = 2 * Math.sqrt(Math.log10(n) / n);
  const insignificant = (lag: number): boolean => Math.abs(cov[lag]! / c0) < critical;

  let mHat = -1;
  for (let j = 1; j + kn - 1 <= mMax && mHat < 0; j++) {
    let run = true;
    for (let k = 0; k < kn && run; k++) run = insignificant(j + k);
    if (run) mHat = j;
  }
  if (mHat < 0) {
    mHat = 1;
    for (let lag = mMax; lag >= 1; lag--) {
      if (!insignificant(lag)) {
        mHat = lag;
        break;
      }
    }
  }
  const m = Math.min(2 * mHat, mMax);
  let g = 0;
  let sum = 0;
  for (let k = -m; k <= m; k++) {
    const w = flatTop(k / m) * cov[Math.abs(k)]!;
    g += w * Math.abs(k);
    sum += w;
  }
  const d = (4 / 3) * sum * sum;
  if (!(d > 0)) return 1;
  const b = Math.ceil(Math.cbrt((2 * g * g) / d) * Math.cbrt(n));
  return Math.max(1, Math.min(bMax, b));
}
