import { describe, expect, it } from 'vitest';
import { reduceForDisplay } from '../../../shared/charts/index.js';

describe('reduceForDisplay', () => {
  const n = 14_400; // 4 h at 1 s
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const y = Float64Array.from({ length: n }, (_, i) => 200 + 20 * Math.sin(i / 50));
  y[9001] = 1150; // a one-second sprint peak
  y[3000] = -5; // a single low reading

  it('keeps at most maxPoints points', () => {
    expect(reduceForDisplay(x, y, 2000).x.length).toBeLessThanOrEqual(2000);
  });

  it('keeps the highest peak and the lowest dip exactly', () => {
    const r = reduceForDisplay(x, y, 500);
    expect(Math.max(...r.y)).toBe(1150);
    expect(r.x[r.y.indexOf(1150)]).toBe(9001);
    expect(Math.min(...r.y)).toBe(-5);
  });

  it('keeps x ascending', () => {
    const r = reduceForDisplay(x, y, 300);
    for (let i = 1; i < r.x.length; i++) expect(r.x[i]!).toBeGreaterThan(r.x[i - 1]!);
  });

  it('keeps a long dropout as a gap', () => {
    const gappy = y.slice();
    gappy.fill(NaN, 5000, 6000);
    const r = reduceForDisplay(x, gappy, 200);
    expect(r.y.some((v) => Number.isNaN(v))).toBe(true);
  });

  it('copies a series that already fits', () => {
    const r = reduceForDisplay([0, 1, 2], [5, NaN, 7], 10);
    expect(Array.from(r.y)).toEqual([5, NaN, 7]);
  });
});
