/** Twiddle factors of a power-of-two transform size: cos and -sin of 2 pi k / n for k < n / 2. */
export interface FftTwiddles {
  cos: Float64Array;
  /** Of the forward transform (-sin); the inverse uses their negation. */
  sin: Float64Array;
}

/**
 * The twiddle table of size `n`, for callers that run several transforms of one size and
 * would otherwise have each call rebuild it. Computed from exact sin/cos per k, not by
 * repeated multiplication, so rounding does not build up across stages.
 *
 * @example const tw = fftTwiddles(1024); fft(re, im, false, tw); fft(re, im, true, tw);
 */
export function fftTwiddles(n: number): FftTwiddles {
  const half = n >> 1;
  const cos = new Float64Array(half);
  const sin = new Float64Array(half);
  for (let k = 0; k < half; k++) {
    const a = (2 * Math.PI * k) / n;
    cos[k] = Math.cos(a);
    sin[k] = -Math.sin(a);
  }
  return { cos, sin };
}

/**
 * In-place iterative radix-2 FFT of a complex signal held as two Float64Arrays.
 * The length must be a power of two (see {@link fftSize}). The inverse includes the
 * 1/n scale, so `fft(re, im, true)` after `fft(re, im)` restores the input. O(n log n).
 *
 * @param re real parts (overwritten)
 * @param im imaginary parts (overwritten)
 * @param inverse false (default) for the forward transform e^{-2 pi i k n / N}
 * @param twiddles the table of {@link fftTwiddles} for this length (built when not given)
 * @example
 * const re = Float64Array.of(1, 0, 0, 0), im = new Float64Array(4);
 * fft(re, im); // re = [1, 1, 1, 1]
 */
export function fft(re: Float64Array, im: Float64Array, inverse = false, twiddles?: FftTwiddles): void {
  const n = re.length;
  if (n !== im.length || (n & (n - 1)) !== 0) {
    throw new RangeError(`fft needs two arrays of one power-of-two length, got ${n} and ${im.length}`);
  }
  if (n <= 1) return;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      let t = re[i]!;
      re[i] = re[j]!;
      re[j] = t;
      t = im[i]!;
      im[i] = im[j]!;
      im[j] = t;
    }
  }
  const { cos, sin } = twiddles ?? fftTwiddles(n);
  if (cos.length !== n >> 1) throw new RangeError(`fft of length ${n} was given twiddles of length ${2 * cos.length}`);
  // Negating the forward table is exact, so the inverse's factors are +sin as computed.
  const sign = inverse ? -1 : 1;
  for (let size = 2; size <= n; size <<= 1) {
    const h = size >> 1;
    const step = n / size;
    for (let start = 0; start < n; start += size) {
      for (let k = 0; k < h; k++) {
        const wr = cos[k * step]!;
        const wi = sign * sin[k * step]!;
        const a = start + k;
        const b = a + h;
        const xr = re[b]! * wr - im[b]! * wi;
        const xi = re[b]! * wi + im[b]! * wr;
        re[b] = re[a]! - xr;
        im[b] = im[a]! - xi;
        re[a] = re[a]! + xr;
        im[a] = im[a]! + xi;
      }
    }
  }
  if (inverse) {
    for (let i = 0; i < n; i++) {
      re[i] = re[i]! / n;
      im[i] = im[i]! / n;
    }
  }
}

/**
 * Smallest power of two that is at least `n` (and at least 1).
 *
 * @example fftSize(5) // 8
 */
export function fftSize(n: number): number {
  let size = 1;
  while (size < n) size <<= 1;
  return size;
}
