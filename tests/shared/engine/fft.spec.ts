import { describe, expect, it } from 'vitest';
import { fft, fftSize } from '../../../shared/engine/fft.js';
import { createRandom } from '../../../shared/synthetic/random.js';

/** The O(n^2) definition X[k] = sum_n x[n] e^{-2 pi i k n / N}, as an independent check. */
function naiveDft(re: Float64Array, im: Float64Array): [Float64Array, Float64Array] {
  const n = re.length;
  const outRe = new Float64Array(n);
  const outIm = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    for (let j = 0; j < n; j++) {
      const a = (-2 * Math.PI * k * j) / n;
      outRe[k] += re[j]! * Math.cos(a) - im[j]! * Math.sin(a);
      outIm[k] += re[j]! * Math.sin(a) + im[j]! * Math.cos(a);
    }
  }
  return [outRe, outIm];
}

describe('fft', () => {
  it('matches the DFT definition on random complex input', () => {
    const rnd = createRandom(5);
    const re = Float64Array.from({ length: 64 }, () => rnd.gaussian());
    const im = Float64Array.from({ length: 64 }, () => rnd.gaussian());
    const [expRe, expIm] = naiveDft(re, im);
    fft(re, im);
    for (let k = 0; k < 64; k++) {
      expect(re[k]).toBeCloseTo(expRe[k]!, 10);
      expect(im[k]).toBeCloseTo(expIm[k]!, 10);
    }
  });

  it('restores the input after the inverse transform', () => {
    const re = Float64Array.of(3, -1, 4, 1, -5, 9, 2, 6);
    const im = new Float64Array(8);
    const copy = re.slice();
    fft(re, im);
    fft(re, im, true);
    for (let k = 0; k < 8; k++) {
      expect(re[k]).toBeCloseTo(copy[k]!, 12);
      expect(im[k]).toBeCloseTo(0, 12);
    }
  });

  it('refuses a length that is not a power of two', () => {
    expect(() => fft(new Float64Array(6), new Float64Array(6))).toThrow(RangeError);
  });

  it('rounds sizes up to a power of two', () => {
    expect([fftSize(0), fftSize(1), fftSize(5), fftSize(1024), fftSize(1025)]).toEqual([1, 1, 8, 1024, 2048]);
  });
});
