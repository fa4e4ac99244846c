import { describe, expect, it } from 'vitest';
import { buildSelection } from '../../../shared/engine/build-selection.js';
import type { Table } from '../../../shared/engine/table.js';

const table: Table = {
  timeS: Float64Array.of(0, 1, 2, 3, 4, 5),
  columns: {
    ref_power: Float64Array.of(100, 200, 300, NaN, 250, 150),
    cadence: Float64Array.of(80, 90, 100, 90, 70, 95),
    front_teeth: Float64Array.of(50, 50, 34, 34, NaN, 50),
  },
};

describe('buildSelection', () => {
  it('selects every row when nothing is asked', () => {
    expect(Array.from(buildSelection(table))).toEqual([1, 1, 1, 1, 1, 1]);
  });

  it('combines ranges, gear, power band and cadence band with AND', () => {
    expect(Array.from(buildSelection(table, { ranges: [{ startS: 4, endS: 6 }, { startS: 0, endS: 2 }] }))).toEqual([1, 1, 0, 0, 1, 1]);
    expect(Array.from(buildSelection(table, { frontTeeth: 50 }))).toEqual([1, 1, 0, 0, 0, 1]);
    expect(Array.from(buildSelection(table, { powerW: { min: 150, max: 260 } }))).toEqual([0, 1, 0, 0, 1, 1]);
    expect(Array.from(buildSelection(table, { frontTeeth: 50, cadenceRpm: { min: 85 } }))).toEqual([0, 1, 0, 0, 0, 1]);
  });
});
