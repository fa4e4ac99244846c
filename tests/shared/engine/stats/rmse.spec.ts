import { describe, expect, it } from 'vitest';
import { rootMeanSquare } from 'simple-statistics';
import { rmse } from '../../../../shared/engine/stats/rmse.js';

describe('rmse', () => {
  it('is the root mean square of the differences (checked with simple-statistics rootMeanSquare)', () => {
    const test = [101, 97, 104, 100];
    const reference = [100, 100, 100, 100];
    expect(rmse(test, reference)).toBeCloseTo(rootMeanSquare([1, -3, 4, 0]), 14);
    expect(rmse(test, reference)).toBeCloseTo(Math.sqrt(26 / 4), 14);
  });

  it('skips missing pairs and masked samples; NaN when nothing is left', () => {
    expect(rmse([102, NaN, 500], [100, 100, 100], new Uint8Array([1, 1, 0]))).toBe(2);
    expect(rmse([NaN], [1])).toBeNaN();
  });
});
