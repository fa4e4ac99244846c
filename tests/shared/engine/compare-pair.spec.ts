import { describe, expect, it } from 'vitest';
import { buildSelection } from '../../../shared/engine/build-selection.js';
import { comparePair } from '../../../shared/engine/compare-pair.js';
import type { Table } from '../../../shared/engine/table.js';

// Four seconds, two on each chainring; the test reads 10% high on the left leg on 50T.
const table: Table = {
  timeS: Float64Array.of(0, 1, 2, 3, 4),
  columns: {
    ref_power: Float64Array.of(200, 300, 200, 300, NaN),
    test_power: Float64Array.of(210, 315, 200, 300, 250),
    ref_left: Float64Array.of(100, 150, 100, 150, NaN),
    ref_right: Float64Array.of(100, 150, 100, 150, NaN),
    test_left: Float64Array.of(110, 165, 100, 150, 125),
    test_right: Float64Array.of(100, 150, 100, 150, 125),
    front_teeth: Float64Array.of(50, 50, 34, 34, 34),
  },
};

describe('comparePair', () => {
  it('gives means, differences and ratios per side over the paired rows', () => {
    const s = comparePair(table, { replicates: 0 });
    expect(s.n).toBe(4);
    expect(s.means.reference).toEqual({ total: 250, left: 125, right: 125 });
    expect(s.means.test).toEqual({ total: 256.25, left: 131.25, right: 125 });
    expect(s.diffW.left).toBeCloseTo(6.25, 12);
    expect(s.diffPct.left).toBeCloseTo(5, 12);
    expect(s.ratio.total).toBeCloseTo(1.025, 12);
    expect(s.ratioCi.total).toBeNull();
    expect(s.agreement.biasW).toBeCloseTo(6.25, 12);
  });

  it('restricts every statistic to a selection', () => {
    const s = comparePair(table, { mask: buildSelection(table, { frontTeeth: 50 }), replicates: 200, seed: 2 });
    expect(s.n).toBe(2);
    expect(s.diffPct.left).toBeCloseTo(10, 12);
    expect(s.diffPct.right).toBeCloseTo(0, 12);
    expect(s.origin.slope).toBeCloseTo(1.05, 12);
    expect(s.ratioCi.left!.estimate).toBeCloseTo(1.1, 12);
  });
});
