import { describe, expect, it } from 'vitest';
import { resample } from '../../../shared/engine/resample.js';
import { resampleColumn } from '../../../shared/engine/resample-column.js';
import { recordingOf } from './builders.js';

const nanOrValue = (x: Float64Array): (number | null)[] => Array.from(x, (v) => (Number.isNaN(v) ? null : Math.round(v * 1e9) / 1e9));

describe('resampleColumn', () => {
  it('interpolates linearly between samples up to maxGapS apart', () => {
    const out = resampleColumn(Float64Array.of(0, 2, 4), Float64Array.of(100, 200, 100), { startS: 0, intervalS: 0.5, count: 9 });
    expect(nanOrValue(out)).toEqual([100, 125, 150, 175, 200, 175, 150, 125, 100]);
  });

  it('never bridges a dropout: NaN next to a missing sample and across long gaps', () => {
    const time = Float64Array.of(0, 1, 2, 3, 10, 11);
    const power = Float64Array.of(100, NaN, 120, 130, 140, 150);
    const out = resampleColumn(time, power, { startS: 0, intervalS: 1, count: 12, maxGapS: 3 });
    expect(nanOrValue(out)).toEqual([100, null, 120, 130, null, null, null, null, null, null, 140, 150]);
  });

  it('holds the last value for step columns and stops one step after the last sample', () => {
    const out = resampleColumn(Float64Array.of(0, 3), Float64Array.of(50, 34), { startS: -1, intervalS: 1, count: 7, mode: 'step' });
    expect(nanOrValue(out)).toEqual([null, 50, 50, 50, 34, 34, null]);
  });

  it('averages a denser source over each grid bin', () => {
    const time = Float64Array.from({ length: 30 }, (_, i) => i / 10);
    const values = Float64Array.from(time, (t) => (t < 1.5 ? 100 : 200));
    const out = resampleColumn(time, values, { startS: 0, intervalS: 1, count: 3, sourceIntervalS: 0.1 });
    // bins [-0.5, 0.5), [0.5, 1.5), [1.5, 2.5): only existing samples count
    expect(nanOrValue(out)).toEqual([100, 100, 200]);
  });
});

describe('resample', () => {
  it('puts every column on the grid and reads the recording at t + shiftS', () => {
    const rec = recordingOf({
      power: [100, 110, 120, 130, 140],
      columns: { cadence: Float64Array.of(80, 82, 84, 86, 88), frontGearTeeth: Float64Array.of(50, 50, 34, 34, 34) },
    });
    const table = resample(rec, { shiftS: 2 });
    expect(nanOrValue(table.timeS)).toEqual([-2, -1, 0, 1, 2]);
    expect(nanOrValue(table.columns.power!)).toEqual([100, 110, 120, 130, 140]);
    const trimmed = resample(rec, { shiftS: 1.5, startS: 0, endS: 2 });
    expect(nanOrValue(trimmed.columns.power!)).toEqual([115, 125, 135]);
    expect(nanOrValue(trimmed.columns.frontGearTeeth!)).toEqual([50, 34, 34]);
    expect(trimmed.meta).toMatchObject({ intervalS: 1, maxGapS: 3, shiftS: 1.5 });
  });

  it('refuses a grid interval that is not positive', () => {
    expect(() => resample(recordingOf({ power: [1, 2] }), { intervalS: 0 })).toThrow(expect.objectContaining({ code: 'bad_interval' }));
  });
});
