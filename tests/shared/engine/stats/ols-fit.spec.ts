import { describe, expect, it } from 'vitest';
import { linearRegression } from 'simple-statistics';
import { olsFit } from '../../../../shared/engine/stats/ols-fit.js';
import { createRandom } from '../../../../shared/synthetic/random.js';
import norris from '../../../fixtures/reference/strd_linreg_norris.json';
import { expectDigits, numbers } from './digits.js';

describe('olsFit against NIST StRD Linear Regression, Norris (certified values)', () => {
  const fit = olsFit(numbers(norris.data.x), numbers(norris.data.y));
  const [b0, b1] = norris.certified.coefficients;

  it('coefficients to 12 significant digits', () => {
    expect(fit.n).toBe(36);
    expectDigits(fit.intercept, b0!.estimate, 12);
    expectDigits(fit.slope, b1!.estimate, 12);
  });

  it('standard deviations of the coefficients, residual SD and R^2 to 12 digits', () => {
    expectDigits(fit.interceptSe, b0!.sd, 12);
    expectDigits(fit.slopeSe, b1!.sd, 12);
    expectDigits(fit.residualSd, norris.certified.residual_sd, 12);
    expectDigits(fit.r2, norris.certified.r_squared, 12);
  });
});

describe('olsFit against simple-statistics linearRegression as a second implementation', () => {
  it('slope and intercept agree to 1e-10 relative on seeded device-vs-reference data', () => {
    const random = createRandom(11);
    for (let trial = 0; trial < 20; trial++) {
      const n = 10 + random.int(0, 300);
      const x = new Float64Array(n);
      const y = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        x[i] = 100 + 300 * random.next();
        y[i] = 3 + 1.02 * x[i]! + 5 * random.gaussian();
      }
      const fit = olsFit(x, y);
      const other = linearRegression(Array.from(x, (xi, i) => [xi, y[i]!]));
      expect(Math.abs(fit.slope - other.m) / Math.abs(other.m)).toBeLessThan(1e-10);
      expect(Math.abs(fit.intercept - other.b) / Math.abs(other.b)).toBeLessThan(1e-9);
    }
  });
});

describe('olsFit edge cases', () => {
  it('constant x gives NaN slope without throwing', () => {
    const fit = olsFit([200, 200, 200], [199, 201, 202]);
    expect(fit.n).toBe(3);
    expect(fit.slope).toBeNaN();
    expect(fit.intercept).toBeNaN();
  });

  it('two points give the line through them and NaN standard errors', () => {
    const fit = olsFit([100, 200], [102, 206]);
    expect(fit.slope).toBeCloseTo(1.04, 14);
    expect(fit.intercept).toBeCloseTo(-2, 12);
    expect(fit.residualSd).toBeNaN();
    expect(fit.slopeSe).toBeNaN();
  });

  it('skips NaN pairs and masked samples; all NaN gives n = 0', () => {
    const x = new Float64Array([1, 2, NaN, 3, 4]);
    const y = new Float64Array([2, 4, 5, 6, 100]);
    const fit = olsFit(x, y, new Uint8Array([1, 1, 1, 1, 0]));
    expect(fit.n).toBe(3);
    expect(fit.slope).toBeCloseTo(2, 14);
    expect(fit.r2).toBe(1);
    expect(olsFit([NaN], [NaN]).n).toBe(0);
  });
});
