import { describe, expect, it } from 'vitest';
import { reduceForDisplay, reduceRange, rowsForRange, tracesSpec, FULL_SERIES_KEY, type ChartFullSeries } from '../../../shared/charts/index.js';

describe('reduceRange', () => {
  const n = 14_400; // 4 h at 1 s
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const y = Float64Array.from({ length: n }, (_, i) => 150 + ((i * 7919) % 101));

  it('gives back the original samples of a short window, plus one either side', () => {
    const r = reduceRange(x, y, 600, 660, 2000);
    expect(Array.from(r.x)).toEqual(Array.from({ length: 63 }, (_, k) => 599 + k));
    expect(Array.from(r.y)).toEqual(Array.from(r.x, (t) => y[t]!));
  });

  it('reduces a window that is still too long, with its peak kept', () => {
    const spiky = y.slice();
    spiky[5000] = 1200;
    const r = reduceRange(x, spiky, 1000, 9000, 400);
    expect(r.x.length).toBeLessThanOrEqual(400);
    // Buckets of ~40 samples over 999..9001: the kept points stay inside the range.
    expect(Math.min(...r.x)).toBeGreaterThanOrEqual(999);
    expect(Math.min(...r.x)).toBeLessThan(999 + 41);
    expect(Math.max(...r.x)).toBeLessThanOrEqual(9001);
    expect(Math.max(...r.y)).toBe(1200);
  });

  it('matches the whole-series reduction when the range covers everything', () => {
    const whole = reduceRange(x, y, -1, n + 1, 2000);
    const direct = reduceForDisplay(x, y, 2000);
    expect(Array.from(whole.x)).toEqual(Array.from(direct.x));
  });

  it('takes the ends in either order and keeps the edge samples of a range between two samples', () => {
    const r = reduceRange([0, 10, 20, 30], [1, 2, 3, 4], 25, 12, 100);
    expect(Array.from(r.x)).toEqual([10, 20, 30]);
    expect(reduceRange([0, 10], [1, 2], 50, 60, 10).x.length).toBe(1);
  });

  it('gives nothing for an empty series', () => {
    expect(reduceRange([], [], 0, 10, 10).x.length).toBe(0);
  });
});

describe('rowsForRange', () => {
  it('builds the chart rows of each series for the range, with missing values as null', () => {
    const full: ChartFullSeries = {
      xField: 't',
      x: [0, 1, 2, 3, 4, 5],
      series: [
        { yField: 'value', values: [1, 2, null, 4, 5, 6], fields: { device: 'A' } },
        { yField: 'value', values: [7, 8, 9, 10, 11, 12], fields: { device: 'B' } },
      ],
      maxPoints: 4,
    };
    expect(rowsForRange(full, 2, 3)).toEqual([
      { t: 1, value: 2, device: 'A' },
      { t: 2, value: null, device: 'A' },
      { t: 3, value: 4, device: 'A' },
      { t: 4, value: 5, device: 'A' },
      { t: 1, value: 8, device: 'B' },
      { t: 2, value: 9, device: 'B' },
      { t: 3, value: 10, device: 'B' },
      { t: 4, value: 11, device: 'B' },
    ]);
  });

  it('is carried by a traces chart only when its series was reduced', () => {
    const long = Array.from({ length: 3000 }, (_, i) => i);
    const spec = tracesSpec({ timeS: long, series: [{ label: 'Ref', colourIndex: 0, values: long }] }) as { usermeta?: Record<string, ChartFullSeries> };
    expect(spec.usermeta?.[FULL_SERIES_KEY]?.x.length).toBe(3000);
    const short = tracesSpec({ timeS: [0, 1], series: [{ label: 'Ref', colourIndex: 0, values: [1, 2] }] }) as { usermeta?: unknown };
    expect(short.usermeta).toBeUndefined();
  });
});
