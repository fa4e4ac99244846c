import { describe, expect, it } from 'vitest';
import { fitLinearModel } from '../../../shared/engine/fit-linear-model.js';
import { olsFit } from '../../../shared/engine/stats/index.js';
import { createRandom } from '../../../shared/synthetic/random.js';

describe('fitLinearModel', () => {
  it('recovers exact coefficients of a noise-free model, skipping NaN rows', () => {
    const x1 = Float64Array.of(1, 2, 3, 4, 5, 6, NaN);
    const x2 = Float64Array.of(0, 1, 0, 1, 0, 2, 1);
    const ones = new Float64Array(7).fill(1);
    const y = Float64Array.from(x1, (v, i) => 3 + 2 * v - 4 * x2[i]!);
    const fit = fitLinearModel([ones, x1, x2], y);
    expect(fit.n).toBe(6);
    expect(fit.coefficients[0]).toBeCloseTo(3, 10);
    expect(fit.coefficients[1]).toBeCloseTo(2, 10);
    expect(fit.coefficients[2]).toBeCloseTo(-4, 10);
  });

  it('agrees with simple OLS (slope, intercept and their standard errors) for one regressor plus a constant', () => {
    const rnd = createRandom(3);
    const x = Float64Array.from({ length: 200 }, () => 100 + 50 * rnd.gaussian());
    const y = Float64Array.from(x, (v) => 5 + 1.02 * v + 3 * rnd.gaussian());
    const fit = fitLinearModel([new Float64Array(200).fill(1), x], y);
    const ols = olsFit(x, y);
    expect(fit.coefficients[1]).toBeCloseTo(ols.slope, 9);
    expect(fit.coefficients[0]).toBeCloseTo(ols.intercept, 7);
    expect(fit.standardErrors[1]).toBeCloseTo(ols.slopeSe, 9);
    expect(fit.standardErrors[0]).toBeCloseTo(ols.interceptSe, 7);
  });

  it('gives NaN for a singular design', () => {
    const x = Float64Array.of(1, 2, 3);
    expect(fitLinearModel([x, x], Float64Array.of(1, 2, 3)).coefficients.every(Number.isNaN)).toBe(true);
  });
});
