import { describe, expect, it } from 'vitest';
import {
  combinedTolerance,
  meanOfRatios,
  percentDifference,
  withinTolerance,
  worstCaseTolerance,
} from '../../../../shared/engine/stats/percent-difference.js';
import { legGainFromTotal, totalFromLegGain } from '../../../../shared/engine/stats/leg-gain.js';

describe('percent difference and tolerance (common practice, no published source)', () => {
  it('left-leg means 90.40 W vs 90.97 W read -0.63%, and 113.81 W vs 114.62 W read -0.71%, both within +/-2%', () => {
    const first = percentDifference(90.4, 90.97);
    const second = percentDifference(113.81, 114.62);
    expect(first.toFixed(2)).toBe('-0.63');
    expect(second.toFixed(2)).toBe('-0.71');
    expect(withinTolerance(first, 2)).toBe(true);
    expect(withinTolerance(second, 2)).toBe(true);
    expect(withinTolerance(2.5, 2)).toBe(false);
  });

  it('four section ratios 88.34%, 88.07%, 87.04%, 86.74% average to 87.55%, a 12.45% difference', () => {
    const mean = meanOfRatios([0.8834, 0.8807, 0.8704, 0.8674]);
    expect((mean * 100).toFixed(2)).toBe('87.55');
    expect(((1 - mean) * 100).toFixed(2)).toBe('12.45');
    expect(meanOfRatios([0.9, NaN, 1.1])).toBeCloseTo(1, 15);
    expect(meanOfRatios([])).toBeNaN();
  });

  it('a 2% device against a 1% reference: root-sum-square 2.24%, worst case 3%', () => {
    expect(combinedTolerance(2, 1)).toBeCloseTo(Math.sqrt(5), 15);
    expect(combinedTolerance(2, 1).toFixed(2)).toBe('2.24');
    expect(worstCaseTolerance(2, 1)).toBe(3);
  });
});

describe('gain on one leg (common practice, no published source)', () => {
  it('a 5.74% total excess pinned on one leg at an even split is 11.48% on that leg', () => {
    expect(legGainFromTotal(5.74, 0.5)).toBeCloseTo(11.48, 12);
    expect(totalFromLegGain(11.48, 0.5)).toBeCloseTo(5.74, 12);
  });

  it('an uneven split scales accordingly (a leg carrying 48% shows 48% of its error in the total)', () => {
    expect(totalFromLegGain(10, 0.48)).toBeCloseTo(4.8, 12);
    expect(legGainFromTotal(totalFromLegGain(7, 0.52), 0.52)).toBeCloseTo(7, 12);
  });
});
