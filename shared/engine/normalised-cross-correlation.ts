import { fft, fftSize } from './fft.js';

/** Pearson correlation of `a[n + k]` with `v[n]` for every lag, over the pairs where both are finite. */
export interface NormalisedCrossCorrelation {
  /** Correlation per lag; index `j` holds lag `k = j - (v.length - 1)` (numpy 'full' order). NaN where the overlap is too small or flat. */
  correlation: Float64Array;
  /** Number of pairs where both samples are finite, per lag. */
  overlap: Float64Array;
}

/**
 * Cross-correlation normalised by the overlap at each lag: for lag k it is the Pearson
 * correlation of `a[n + k]` and `v[n]` over the n where both are finite. Missing samples
 * (NaN) are masked, not treated as zero, and every lag is scaled by its own overlap, so
 * short overlaps at the edges cannot win by size alone. Six masked correlations through
 * the FFT: O(n log n).
 *
 * @param minOverlap lags with fewer finite pairs give NaN (default 2)
 * @example
 * normalisedCrossCorrelation([1, 2, 3, 5], [1, 2, 3, 5]).correlation[3] // 1 (lag 0)
 */
export function normalisedCrossCorrelation(
  a: ArrayLike<number>,
  v: ArrayLike<number>,
  minOverlap = 2,
): NormalisedCrossCorrelation {
  const la = a.length;
  const lv = v.length;
  const outLength = Math.max(0, la + lv - 1);
  const correlation = new Float64Array(outLength).fill(NaN);
  const overlap = new Float64Array(outLength);
  if (outLength === 0) return { correlation, overlap };
  const n = fftSize(outLength);
  // Centring by the mean of the finite samples changes no correlation and keeps the
  // sums small, so the subtraction in the Pearson formula loses few digits.
  const meanA = finiteMean(a);
  const meanV = finiteMean(v);
  const sA = spectra(a, meanA, n);
  const sV = spectra(v, meanV, n);
  const count = correlateSpectra(sA.mask, sV.mask);
  const sumAV = correlateSpectra(sA.value, sV.value);
  const sumA = correlateSpectra(sA.value, sV.mask);
  const sumV = correlateSpectra(sA.mask, sV.value);
  const sumAA = correlateSpectra(sA.square, sV.mask);
  const sumVV = correlateSpectra(sA.mask, sV.square);
  for (let j = 0; j < outLength; j++) {
    const k = j - (lv - 1);
    const idx = (k + n) % n;
    const m = Math.round(count[idx]!);
    overlap[j] = m;
    if (m < minOverlap) continue;
    const sa = sumA[idx]!;
    const sv = sumV[idx]!;
    const cov = sumAV[idx]! - (sa * sv) / m;
    const varA = sumAA[idx]! - (sa * sa) / m;
    const varV = sumVV[idx]! - (sv * sv) / m;
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

function spectra(x: ArrayLike<number>, mean: number, n: number): { value: Spectrum; mask: Spectrum; square: Spectrum } {
  const value = { re: new Float64Array(n), im: new Float64Array(n) };
  const mask = { re: new Float64Array(n), im: new Float64Array(n) };
  const square = { re: new Float64Array(n), im: new Float64Array(n) };
  for (let i = 0; i < x.length; i++) {
    const raw = x[i]!;
    if (!Number.isFinite(raw)) continue;
    const c = raw - mean;
    value.re[i] = c;
    mask.re[i] = 1;
    square.re[i] = c * c;
  }
  fft(value.re, value.im);
  fft(mask.re, mask.im);
  fft(square.re, square.im);
  return { value, mask, square };
}

/** Inverse transform of A * conj(V): the circular correlation sum_n a[n + k] v[n] at index k mod n. */
function correlateSpectra(a: Spectrum, v: Spectrum): Float64Array {
  const n = a.re.length;
  const re = new Float64Array(n);
  const im = new Float64Array(n);
  for (let f = 0; f < n; f++) {
    re[f] = a.re[f]! * v.re[f]! + a.im[f]! * v.im[f]!;
    im[f] = a.im[f]! * v.re[f]! - a.re[f]! * v.im[f]!;
  }
  fft(re, im, true);
  return re;
}
