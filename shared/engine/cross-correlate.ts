import { fft, fftSize } from './fft.js';

/**
 * Full discrete cross-correlation of two real sequences through the FFT, O(n log n):
 * `c[k] = sum_n a[n + k] * v[n]`, returned for every lag k from `-(v.length - 1)` to
 * `a.length - 1`; output index `j` holds lag `k = j - (v.length - 1)`. This is the
 * convention (and the output) of numpy's `correlate(a, v, 'full')`.
 *
 * @example
 * crossCorrelate([1, 2, 3], [0, 1, 0.5]) // ≈ [0.5, 2, 3.5, 3, 0]
 */
export function crossCorrelate(a: ArrayLike<number>, v: ArrayLike<number>): Float64Array {
  const la = a.length;
  const lv = v.length;
  if (la === 0 || lv === 0) return new Float64Array(0);
  const outLength = la + lv - 1;
  const n = fftSize(outLength);
  const ar = new Float64Array(n);
  const ai = new Float64Array(n);
  const vr = new Float64Array(n);
  const vi = new Float64Array(n);
  for (let i = 0; i < la; i++) ar[i] = a[i]!;
  for (let i = 0; i < lv; i++) vr[i] = v[i]!;
  fft(ar, ai);
  fft(vr, vi);
  // A(f) * conj(V(f)) is the transform of the circular correlation sum_n a[n+k] v[n].
  for (let f = 0; f < n; f++) {
    const re = ar[f]! * vr[f]! + ai[f]! * vi[f]!;
    const im = ai[f]! * vr[f]! - ar[f]! * vi[f]!;
    ar[f] = re;
    ai[f] = im;
  }
  fft(ar, ai, true);
  const out = new Float64Array(outLength);
  for (let j = 0; j < outLength; j++) {
    const k = j - (lv - 1);
    out[j] = ar[(k + n) % n]!;
  }
  return out;
}
