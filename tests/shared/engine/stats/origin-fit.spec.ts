import { describe, expect, it } from 'vitest';
import { originFit } from '../../../../shared/engine/stats/origin-fit.js';
import noint1 from '../../../fixtures/reference/strd_linreg_noint1.json';
import { expectDigits, numbers } from './digits.js';

describe('originFit against NIST StRD Linear Regression, NoInt1 (certified values)', () => {
  const fit = originFit(numbers(noint1.data.x), numbers(noint1.data.y));
  const [b1] = noint1.certified.coefficients;

  it('slope, its SD and the residual SD to 13 digits', () => {
    expect(fit.n).toBe(11);
    expectDigits(fit.slope, b1!.estimate, 13);
    expectDigits(fit.slopeSe, b1!.sd, 13);
    expectDigits(fit.residualSd, noint1.certified.residual_sd, 13);
  });

  it('R^2 in NIST\'s uncentred form 1 - RSS / sum(y^2) to 13 digits', () => {
    expectDigits(fit.r2Uncentred, noint1.certified.r_squared, 13);
  });
});

describe('originFit edge cases', () => {
  it('a pure gain is recovered exactly', () => {
    const fit = originFit([100, 200, 300], [102, 204, 306]);
    expect(fit.slope).toBeCloseTo(1.02, 15);
    expect(fit.residualSd).toBeCloseTo(0, 12);
  });

  it('all x zero or no pair gives NaN without throwing', () => {
    expect(originFit([0, 0], [1, 2]).slope).toBeNaN();
    expect(originFit([NaN], [1]).n).toBe(0);
  });

  it('one pair gives a slope but no standard error', () => {
    const fit = originFit([100], [98]);
    expect(fit.slope).toBeCloseTo(0.98, 15);
    expect(fit.slopeSe).toBeNaN();
  });
});
