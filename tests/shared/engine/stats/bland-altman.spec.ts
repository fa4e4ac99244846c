import { describe, expect, it } from 'vitest';
import { blandAltman } from '../../../../shared/engine/stats/bland-altman.js';
import { studentTQuantile } from '../../../../shared/engine/stats/student-t.js';
import pefr from '../../../fixtures/reference/bland_altman_1986_pefr.json';

const round1 = (v: number): number => Math.round(v * 10) / 10;
const derived = pefr['derived_full_precision_first_readings (computed here, exact arithmetic; NOT published)'];

describe('blandAltman on the PEFR data of Bland & Altman, The Lancet 1986 (Table 1, first readings)', () => {
  // Differences Wright - mini Wright, as in the paper.
  const result = blandAltman(pefr.wright_1, pefr.mini_1, { multiplier: 2 });
  const published = pefr.published_expected;

  it('reproduces the published bias -2.1 and SD 38.8 l/min', () => {
    expect(result.n).toBe(17);
    expect(round1(result.biasW)).toBe(published.mean_difference);
    expect(round1(result.sdW)).toBe(published.sd_of_differences);
  });

  it('reproduces the published limits -79.7 and 75.5 (the paper computed d +/- 2s from rounded d and s)', () => {
    expect(round1(round1(result.biasW) - 2 * round1(result.sdW))).toBe(published.limits_of_agreement_2sd.lower);
    expect(round1(round1(result.biasW) + 2 * round1(result.sdW))).toBe(published.limits_of_agreement_2sd.upper);
    // Unrounded, the limits are within 0.1 of the published ones.
    expect(Math.abs(result.loaLowW - published.limits_of_agreement_2sd.lower)).toBeLessThan(0.1);
    expect(Math.abs(result.loaHighW - published.limits_of_agreement_2sd.upper)).toBeLessThan(0.1);
  });

  it('reproduces the published standard errors 9.4 (bias) and 16.3 (limits, sqrt(3 s^2/n))', () => {
    expect(round1(result.seBias)).toBe(published.se_of_mean_difference);
    expect(round1(result.seLoa)).toBe(published.se_of_limits);
  });

  it('reproduces the published 95% CI of the bias, -22.0 to 17.8', () => {
    expect(round1(result.biasCi[0])).toBe(published.ci95_mean_difference.lower);
    expect(round1(result.biasCi[1])).toBe(published.ci95_mean_difference.upper);
  });

  it('reproduces the published CIs of the limits (paper: t = 2.12 and rounded limit and SE)', () => {
    // The paper prints t(16) = 2.12 and works from the rounded limits and SE 16.3.
    const t = studentTQuantile(0.975, 16);
    expect(Math.round(t * 100) / 100).toBe(2.12);
    const se = round1(result.seLoa);
    const paperLow = round1(round1(result.biasW) - 2 * round1(result.sdW));
    const paperHigh = round1(round1(result.biasW) + 2 * round1(result.sdW));
    expect(round1(paperHigh - 2.12 * se)).toBe(published.ci95_upper_limit.lower);
    expect(round1(paperHigh + 2.12 * se)).toBe(published.ci95_upper_limit.upper);
    expect(round1(paperLow - 2.12 * se)).toBe(published.ci95_lower_limit.lower);
    expect(round1(paperLow + 2.12 * se)).toBe(published.ci95_lower_limit.upper);
    // Unrounded, the computed intervals lie within 0.2 l/min of the published ones.
    expect(Math.abs(result.loaHighCi[0] - published.ci95_upper_limit.lower)).toBeLessThan(0.2);
    expect(Math.abs(result.loaHighCi[1] - published.ci95_upper_limit.upper)).toBeLessThan(0.2);
    expect(Math.abs(result.loaLowCi[0] - published.ci95_lower_limit.lower)).toBeLessThan(0.2);
    expect(Math.abs(result.loaLowCi[1] - published.ci95_lower_limit.upper)).toBeLessThan(0.2);
  });

  it('matches the exact-arithmetic values derived from the same data (derived, not published)', () => {
    expect(result.biasW).toBeCloseTo(-36 / 17, 13);
    expect(result.sdW).toBeCloseTo(derived.sd_of_differences, 12);
    expect(result.loaLowW).toBeCloseTo(derived.loa_2sd[0]!, 12);
    expect(result.loaHighW).toBeCloseTo(derived.loa_2sd[1]!, 12);
    expect(result.seBias).toBeCloseTo(derived.se_of_mean_difference, 12);
    expect(result.seLoa).toBeCloseTo(derived.se_of_limits_sqrt_3s2_over_n, 12);
  });

  it('uses 1.96 SD by default (derived, not published: limits at d +/- 1.96 s)', () => {
    const r = blandAltman(pefr.wright_1, pefr.mini_1);
    expect(r.loaLowW).toBeCloseTo(derived.loa_1_96sd[0]!, 12);
    expect(r.loaHighW).toBeCloseTo(derived.loa_1_96sd[1]!, 12);
  });
});

describe('blandAltman edge cases', () => {
  it('skips pairs with a missing side and honours the mask', () => {
    const test = new Float64Array([102, NaN, 104, 500]);
    const reference = new Float64Array([100, 100, 100, 100]);
    const r = blandAltman(test, reference, { mask: new Uint8Array([1, 1, 1, 0]) });
    expect(r.n).toBe(2);
    expect(r.biasW).toBe(3);
    expect(r.sdW).toBeCloseTo(Math.SQRT2, 14);
  });

  it('one pair gives a bias but NaN spread and intervals', () => {
    const r = blandAltman([105], [100]);
    expect(r.n).toBe(1);
    expect(r.biasW).toBe(5);
    expect(r.sdW).toBeNaN();
    expect(r.biasCi[0]).toBeNaN();
  });

  it('no pair at all gives NaN without throwing', () => {
    const r = blandAltman([NaN], [NaN]);
    expect(r.n).toBe(0);
    expect(r.biasW).toBeNaN();
  });
});
