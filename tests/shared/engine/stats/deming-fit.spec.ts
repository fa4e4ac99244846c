import { describe, expect, it } from 'vitest';
import { demingFit } from '../../../../shared/engine/stats/deming-fit.js';
import { demingJackknife } from '../../../../shared/engine/stats/deming-jackknife.js';
import { olsFit } from '../../../../shared/engine/stats/ols-fit.js';
import { summary } from '../../../../shared/engine/stats/summary.js';
import td15 from '../../../fixtures/reference/deming_mcr_td15.json';
import wicklin from '../../../fixtures/reference/deming_wicklin_2019.json';

const close = (actual: number, expected: string | number, tolerance: number): void => {
  expect(Math.abs(actual - Number(expected)), `${actual} vs ${expected}`).toBeLessThan(tolerance);
};

describe('demingFit against the reference results of R package mcr, test case AnaIT TD15 (x = reference, y = test)', () => {
  it.each([
    ['Deming.1', 1],
    ['Deming.121', 1.21],
  ] as const)('%s: slope and intercept to 1e-12 (errorRatio = var(error of x)/var(error of y), mcr\'s error.ratio)', (key, ratio) => {
    const expected = td15.reference_results[key].reference_results;
    const fit = demingFit(td15.x, td15.y, { errorRatio: ratio });
    expect(fit.n).toBe(50);
    expect(fit.errorRatio).toBe(ratio);
    close(fit.slope, expected.Slope, 1e-12);
    close(fit.intercept, expected.Intercept, 1e-12);
  });

  it.each([
    ['Deming.1', 1],
    ['Deming.121', 1.21],
  ] as const)('%s: jackknife 95%% intervals to 1e-6 (mcr\'s own equivalence precision)', (key, ratio) => {
    const expected = td15.reference_results[key].reference_results;
    const jk = demingJackknife(td15.x, td15.y, { errorRatio: ratio });
    close(jk.slope, expected.Slope, 1e-12);
    close(jk.slopeCi[0], expected.SlopeL, 1e-6);
    close(jk.slopeCi[1], expected.SlopeU, 1e-6);
    close(jk.interceptCi[0], expected.InterceptL, 1e-6);
    close(jk.interceptCi[1], expected.InterceptU, 1e-6);
  });

  it('the estimated bias (Y - X) at X = 1, 10, 100 follows from the line as in mcr (calcBias)', () => {
    const expected = td15.reference_results['Deming.121'].reference_results.Bias.split(',').map(Number);
    const fit = demingFit(td15.x, td15.y, { errorRatio: 1.21 });
    [1, 10, 100].forEach((x, k) => close(fit.intercept + (fit.slope - 1) * x, expected[k]!, 1e-9));
  });

  it('errorRatio 0 (error-free reference) is ordinary least squares, checked against mcr\'s LinReg result', () => {
    const expected = td15.reference_results.LinReg.reference_results;
    const fit = demingFit(td15.x, td15.y, { errorRatio: 0 });
    close(fit.slope, expected.Slope, 1e-12);
    close(fit.intercept, expected.Intercept, 1e-12);
    close(olsFit(td15.x, td15.y).slope, expected.Slope, 1e-12);
  });

  it('swapping the axes and inverting the ratio gives the reciprocal slope (symmetry of the model)', () => {
    const forward = demingFit(td15.x, td15.y, { errorRatio: 1.21 });
    const backward = demingFit(td15.y, td15.x, { errorRatio: 1 / 1.21 });
    close(forward.slope * backward.slope, 1, 1e-14);
  });
});

describe('demingFit against Wicklin, "Deming regression for comparing different measurement methods", The DO Loop (SAS), 2019', () => {
  it('reproduces the published line -10.56415 + 0.354463 x with the variance ratio estimated from the data', () => {
    // The blog plugs delta = var(x)/var(y) into delta = var(err y)/var(err x); in this
    // module's convention (the inverse) that is errorRatio = var(y)/var(x).
    const sx = summary(wicklin.x).sd;
    const sy = summary(wicklin.y).sd;
    const fit = demingFit(wicklin.x, wicklin.y, { errorRatio: (sy * sy) / (sx * sx) });
    expect(fit.n).toBe(65);
    close(fit.slope, wicklin.published_expected.slope, 5e-7);
    close(fit.intercept, wicklin.published_expected.intercept, 5e-6);
    // Derived (not published): the same fit at full precision.
    close(fit.slope, wicklin.derived_not_published.estimates_at_that_delta.slope, 1e-10);
    close(fit.intercept, wicklin.derived_not_published.estimates_at_that_delta.intercept, 1e-9);
  });

  it('with errorRatio 1 gives the orthogonal line (derived, not published)', () => {
    const fit = demingFit(wicklin.x, wicklin.y);
    close(fit.slope, wicklin.derived_not_published.orthogonal_delta_1.slope, 1e-7);
    close(fit.intercept, wicklin.derived_not_published.orthogonal_delta_1.intercept, 1e-5);
  });
});

describe('demingFit edge cases', () => {
  it('uncorrelated or too few pairs give NaN without throwing', () => {
    expect(demingFit([1, 2, 3], [5, 5, 5]).slope).toBeNaN();
    expect(demingFit([1], [2]).slope).toBeNaN();
    expect(demingFit([NaN, NaN], [1, 2]).n).toBe(0);
  });

  it('jackknife needs three pairs', () => {
    const jk = demingJackknife([1, 2], [1, 2]);
    expect(jk.slope).toBeCloseTo(1, 14);
    expect(jk.slopeSe).toBeNaN();
  });
});
