import { describe, expect, it } from 'vitest';
import { crossCorrelate } from '../../../shared/engine/cross-correlate.js';
import { normalisedCrossCorrelation } from '../../../shared/engine/normalised-cross-correlation.js';
import { pearson } from '../../../shared/engine/stats/index.js';
import { createRandom } from '../../../shared/synthetic/random.js';
import numpyDoc from '../../fixtures/reference/cross_correlation_numpy_doc.json' with { type: 'json' };

describe('crossCorrelate', () => {
  // Published example: NumPy reference, numpy.correlate, Examples section:
  // correlate([1, 2, 3], [0, 1, 0.5], 'full') = [0.5, 2, 3.5, 3, 0].
  it('reproduces the numpy.correlate "full" example and its lag convention', () => {
    const out = crossCorrelate(numpyDoc.a, numpyDoc.v);
    expect(out.length).toBe(numpyDoc.published_expected.full.length);
    numpyDoc.published_expected.full.forEach((value, j) => expect(out[j]).toBeCloseTo(value, 12));
    // 'same' is the centre of 'full' (length of a), per the same documentation.
    const same = out.slice(1, 4);
    numpyDoc.published_expected.same.forEach((value, j) => expect(same[j]).toBeCloseTo(value, 12));
  });

  it('puts a shifted copy at the lag k where a[n + k] = v[n]', () => {
    const v = [0, 0, 1, 0, 0, 0];
    const a = [0, 0, 0, 0, 1, 0]; // the pulse sits 2 samples later in a
    const out = crossCorrelate(a, v);
    const best = out.indexOf(Math.max(...out));
    expect(best - (v.length - 1)).toBe(2);
  });
});

describe('normalisedCrossCorrelation', () => {
  it('scores every lag by the Pearson correlation over its own overlap, skipping NaN', () => {
    const v = [1, 5, 2, 8, NaN, 3, 9, 4];
    const a = [7, 1, 5, 2, 8, 6, 3, 9, 4]; // v shifted by one, with an extra value where v is NaN
    const { correlation, overlap } = normalisedCrossCorrelation(a, v, { minOverlap: 3 });
    const lag1 = 1 + v.length - 1;
    expect(correlation[lag1]).toBeCloseTo(1, 12);
    expect(overlap[lag1]).toBe(7);
  });

  it('matches the Pearson correlation computed pair by pair at every lag, also over a window of lags', () => {
    const rnd = createRandom(12);
    const a = Array.from({ length: 90 }, (_, i) => (i % 17 === 3 ? NaN : 200 + 40 * rnd.gaussian()));
    const v = Array.from({ length: 70 }, (_, i) => (i % 23 === 5 ? NaN : 200 + 40 * rnd.gaussian()));
    const full = normalisedCrossCorrelation(a, v, { minOverlap: 5 });
    const window = normalisedCrossCorrelation(a, v, { minOverlap: 5, lags: { min: -10, max: 12 } });
    for (let k = -(v.length - 1); k <= a.length - 1; k++) {
      const x: number[] = [];
      const y: number[] = [];
      for (let i = 0; i < v.length; i++) {
        const ai = a[i + k];
        if (ai !== undefined && Number.isFinite(ai) && Number.isFinite(v[i]!)) {
          x.push(ai);
          y.push(v[i]!);
        }
      }
      const j = k + v.length - 1;
      expect(full.overlap[j]).toBe(x.length);
      if (x.length >= 5) expect(full.correlation[j]).toBeCloseTo(pearson(x, y), 9);
      if (k >= -10 && k <= 12) expect(window.correlation[j]).toBeCloseTo(pearson(x, y), 9);
      else expect(window.correlation[j]).toBeNaN();
    }
  });

  it('gives NaN where the overlap is under the minimum', () => {
    const { correlation } = normalisedCrossCorrelation([1, 2, 3, 4], [4, 3, 2, 1], { minOverlap: 3 });
    expect(Number.isNaN(correlation[0]!)).toBe(true);
    expect(correlation[3]).toBeCloseTo(-1, 12);
  });
});
