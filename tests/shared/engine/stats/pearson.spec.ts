import { describe, expect, it } from 'vitest';
import { sampleCorrelation } from 'simple-statistics';
import { pearson } from '../../../../shared/engine/stats/pearson.js';
import { createRandom } from '../../../../shared/synthetic/random.js';
import pefr from '../../../fixtures/reference/bland_altman_1986_pefr.json';

describe('pearson', () => {
  it('agrees with simple-statistics sampleCorrelation to 1e-12 on seeded data', () => {
    const random = createRandom(5);
    for (let trial = 0; trial < 20; trial++) {
      const n = 3 + random.int(0, 200);
      const x = new Float64Array(n);
      const y = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        x[i] = 200 + 50 * random.gaussian();
        y[i] = x[i]! * (0.9 + 0.2 * random.next()) + 10 * random.gaussian();
      }
      expect(Math.abs(pearson(x, y) - sampleCorrelation(Array.from(x), Array.from(y)))).toBeLessThan(1e-12);
    }
  });

  it('gives r = 0.9433 on the 1986 PEFR first readings (derived from the data, not published to 4 digits)', () => {
    const derived = pefr['derived_full_precision_first_readings (computed here, exact arithmetic; NOT published)'];
    expect(pearson(pefr.wright_1, pefr.mini_1)).toBeCloseTo(derived.pearson_r_a_b, 13);
  });

  it('is +/-1 on exact lines and NaN on a constant side', () => {
    expect(pearson([1, 2, 3], [2, 4, 6])).toBe(1);
    expect(pearson([1, 2, 3], [6, 4, 2])).toBe(-1);
    expect(pearson([1, 2, 3], [5, 5, 5])).toBeNaN();
    expect(pearson([1], [5])).toBeNaN();
  });

  it('skips NaN pairs and masked samples', () => {
    const r = pearson([1, 2, NaN, 3, 4], [2, 4, 1, 6, -50], new Uint8Array([1, 1, 1, 1, 0]));
    expect(r).toBe(1);
  });
});
