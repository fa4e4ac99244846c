import { describe, expect, it } from 'vitest';
import { driftFit } from '../../../../shared/engine/stats/drift-fit.js';
import { createRandom } from '../../../../shared/synthetic/random.js';

describe('driftFit', () => {
  it('reports the slope of the difference in W per hour', () => {
    // A difference that grows 3 W over each hour of a 2 h ride, from -1 W.
    const n = 7201;
    const timeS = new Float64Array(n);
    const diffW = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      timeS[i] = i;
      diffW[i] = -1 + (3 * i) / 3600;
    }
    const fit = driftFit(timeS, diffW);
    expect(fit.n).toBe(n);
    expect(fit.wPerHour).toBeCloseTo(3, 10);
    expect(fit.interceptW).toBeCloseTo(-1, 10);
    expect(fit.seWPerHour).toBeCloseTo(0, 10);
  });

  it('the standard error scales with noise and shrinks with ride length', () => {
    const random = createRandom(3);
    const make = (n: number) => {
      const t = new Float64Array(n);
      const d = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        t[i] = i;
        d[i] = 2 * random.gaussian();
      }
      return driftFit(t, d);
    };
    const short = make(1800);
    const long = make(7200);
    expect(long.seWPerHour).toBeLessThan(short.seWPerHour / 4);
    // OLS: SE(slope) = sigma / sqrt(Sxx); for t = 0..n-1, Sxx = n (n^2 - 1) / 12.
    expect(long.seWPerHour / (3600 * 2 / Math.sqrt((7200 * (7200 * 7200 - 1)) / 12))).toBeCloseTo(1, 1);
  });

  it('skips dropouts (NaN) and masked spans', () => {
    const timeS = new Float64Array([0, 1800, 3600, 5400]);
    const diffW = new Float64Array([0, NaN, 2, 50]);
    const fit = driftFit(timeS, diffW, new Uint8Array([1, 1, 1, 0]));
    expect(fit.n).toBe(2);
    expect(fit.wPerHour).toBeCloseTo(2, 12);
  });
});
