import { fft, fftSize, fftTwiddles, type FftTwiddles } from './fft.js';

/** Pearson correlation of `a[n + k]` with `v[n]` for every lag, over the pairs where both are finite. */
export interface NormalisedCrossCorrelation {
  /** Correlation per lag; index `j` holds lag `k = j - (v.length - 1)` (numpy 'full' order). NaN where the overlap is too small or flat, or outside the lags asked for. */
  correlation: Float64Array;
  /** Number of pairs where both samples are finite, per lag. */
  overlap: Float64Array;
}

/** Options of {@link normalisedCrossCorrelation}. */
export interface NormalisedCrossCorrelationOptions {
  /** Lags with fewer finite pairs give NaN (default 2). */
  minOverlap?: number;
  /** Only these lags are needed, inclusive (default all): a smaller transform suffices. */
  lags?: { min: number; max: number };
}

/**
 * Cross-correlation normalised by the overlap at each lag: for lag k it is the Pearson
 * correlation of `a[n + k]` and `v[n]` over the n where both are finite. Missing samples
 * (NaN) are masked, not treated as zero, and every lag is scaled by its own overlap, so
 * short overlaps at the edges cannot win by size alone. Six masked correlations through
 * the FFT, two real signals per complex transform: O(n log n).
 *
 * @example
 * normalisedCrossCorrelation([1, 2, 3, 5], [1, 2, 3, 5]).correlation[3] // 1 (lag 0)
 */
export function normalisedCrossCorrelation(
  a: ArrayLike<number>,
  v: ArrayLike<number>,
  options: NormalisedCrossCorrelationOptions = {},
): NormalisedCrossCorrelation {
  const la = a.length;
  const lv = v.length;
  const minOverlap = options.minOverlap ?? 2;
  const outLength = Math.max(0, la + lv - 1);
  const correlation = new Float64Array(outLength).fill(NaN);
  const overlap = new Float64Array(outLength);
  if (outLength === 0) return { correlation, overlap };
  const lo = Math.max(-(lv - 1), options.lags?.min ?? -(lv - 1));
  const hi = Math.min(la - 1, options.lags?.max ?? la - 1);
  if (hi < lo) return { correlation, overlap };
  // A circular correlation of length n holds lag k plus lags k +- n; those fall outside
  // the non-zero range [-(lv - 1), la - 1] for every wanted k once n >= la - lo and n >= hi + lv.
  const n = fftSize(Math.max(la - lo, hi + lv));
  // One twiddle table serves all six transforms; each pair of real signals travels as the
  // real and imaginary parts of one complex array, built in place.
  const tw = fftTwiddles(n);
  const value = { re: new Float64Array(n), im: new Float64Array(n) };
  const mask = { re: new Float64Array(n), im: new Float64Array(n) };
  const square = { re: new Float64Array(n), im: new Float64Array(n) };
  // Centring by the mean of the finite samples changes no correlation and keeps the
  // sums small, so the subtraction in the Pearson formula loses few digits.
  realParts(a, finiteMean(a), value.re, mask.re, square.re);
  realParts(v, finiteMean(v), value.im, mask.im, square.im);
  const [aValue, vValue] = transformPair(value, tw);
  const [aMask, vMask] = transformPair(mask, tw);
  const [aSquare, vSquare] = transformPair(square, tw);
  const [count, sumAV] = correlatePair(aMask, vMask, aValue, vValue, tw);
  const [sumA, sumV] = correlatePair(aValue, vMask, aMask, vValue, tw);
  const [sumAA, sumVV] = correlatePair(aSquare, vMask, aMask, vSquare, tw);
  for (let k = lo; k <= hi; k++) {
    const j = k + lv - 1;
    const idx = (k + n) % n;
    const m = Math.round(count[idx]!);
    overlap[j] = m;
    if (m < minOverlap) continue;
    const sumAk = sumA[idx]!;
    const sumVk = sumV[idx]!;
    const cov = sumAV[idx]! - (sumAk * sumVk) / m;
    const varA = sumAA[idx]! - (sumAk * sumAk) / m;
    const varV = sumVV[idx]! - (sumVk * sumVk) / m;
    if (varA <= 1e-9 * m || varV <= 1e-9 * m) continue;
    correlation[j] = Math.max(-1, Math.min(1, cov / Math.sqrt(varA * varV)));
  }
  return { correlation, overlap };
}

interface Spectrum {
  re: Float64Array;
  im: Float64Array;
}

function finiteMean(x: ArrayLike<number>): number {
  let sum = 0;
  let m = 0;
  for (let i = 0; i < x.length; i++) {
    const value = x[i]!;
    if (Number.isFinite(value)) {
      sum += value;
      m++;
    }
  }
  return m > 0 ? sum / m : 0;
}

/** Centred values, the finite-sample mask and squared centred values into zeroed arrays (zero padding beyond x). */
function realParts(x: ArrayLike<number>, mean: number, value: Float64Array, mask: Float64Array, square: Float64Array): void {
  for (let i = 0; i < x.length; i++) {
    const raw = x[i]!;
    if (!Number.isFinite(raw)) continue;
    const c = raw - mean;
    value[i] = c;
    mask[i] = 1;
    square[i] = c * c;
  }
}

/**
 * Spectra of two real signals x (in `z.re`) and y (in `z.im`) from one complex transform
 * of x + i y. X overwrites z; Y gets new arrays.
 */
function transformPair(z: Spectrum, tw: FftTwiddles): [Spectrum, Spectrum] {
  const { re, im } = z;
  const n = re.length;
  fft(re, im, false, tw);
  const Y = { re: new Float64Array(n), im: new Float64Array(n) };
  // X[k] = (Z[k] + conj Z[n-k]) / 2, Y[k] = (Z[k] - conj Z[n-k]) / 2i; k and n - k are
  // read together so the spectrum can be rewritten in place.
  for (let k = 0; k <= n >> 1; k++) {
    const m = (n - k) % n;
    const zr = re[k]!;
    const zi = im[k]!;
    const wr = re[m]!;
    const wi = im[m]!;
    re[k] = (zr + wr) / 2;
    im[k] = (zi - wi) / 2;
    Y.re[k] = (zi + wi) / 2;
    Y.im[k] = (wr - zr) / 2;
    re[m] = (wr + zr) / 2;
    im[m] = (wi - zi) / 2;
    Y.re[m] = (wi + zi) / 2;
    Y.im[m] = (zr - wr) / 2;
  }
  return [z, Y];
}

/**
 * Two real circular correlations at once: p = sum_n a1[n + k] v1[n] and
 * q = sum_n a2[n + k] v2[n], from one inverse transform of A1 conj(V1) + i A2 conj(V2).
 */
function correlatePair(a1: Spectrum, v1: Spectrum, a2: Spectrum, v2: Spectrum, tw: FftTwiddles): [Float64Array, Float64Array] {
  const n = a1.re.length;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let f = 0; f < n; f++) {
    const pr = a1.re[f]! * v1.re[f]! + a1.im[f]! * v1.im[f]!;
    const pi = a1.im[f]! * v1.re[f]! - a1.re[f]! * v1.im[f]!;
    const qr = a2.re[f]! * v2.re[f]! + a2.im[f]! * v2.im[f]!;
    const qi = a2.im[f]! * v2.re[f]! - a2.re[f]! * v2.im[f]!;
    re[f] = pr - qi;
    im[f] = pi + qr;
  }
  fft(re, im, true, tw);
  return [re, im];
}
