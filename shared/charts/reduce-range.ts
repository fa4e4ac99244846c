import { finiteOrNull } from './chart-common.js';
import { reduceForDisplay, type ReducedSeries } from './reduce-series.js';
import type { ChartRow } from './spec.js';

/**
 * The samples of a series whose x lies in `[x0, x1]`, plus the one just outside each end (so
 * a line reaches the edges of the zoomed view), reduced to at most `maxPoints` only if they
 * still do not fit: zooming into a short window gives back the original samples, not the
 * reduced ones of the whole ride. `x` must be ascending. O(log n + samples in range).
 *
 * @example reduceRange(time, power, 3600, 3660, 2000) // the 61 (+2) samples of that minute, unchanged
 */
export function reduceRange(x: ArrayLike<number>, y: ArrayLike<number>, x0: number, x1: number, maxPoints: number): ReducedSeries {
  const n = Math.min(x.length, y.length);
  const lo = Math.min(x0, x1);
  const hi = Math.max(x0, x1);
  const from = Math.max(0, firstAtLeast(x, n, lo) - 1);
  const to = Math.min(n, firstAbove(x, n, hi) + 1);
  if (to <= from) return { x: new Float64Array(0), y: new Float64Array(0) };
  const slice = (a: ArrayLike<number>): Float64Array => {
    const out = new Float64Array(to - from);
    for (let i = from; i < to; i++) out[i - from] = a[i]!;
    return out;
  };
  return reduceForDisplay(slice(x), slice(y), maxPoints);
}

/** First index whose x is >= v (n when none). */
function firstAtLeast(x: ArrayLike<number>, n: number, v: number): number {
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (x[mid]! < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First index whose x is > v (n when none). */
function firstAbove(x: ArrayLike<number>, n: number, v: number): number {
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (x[mid]! <= v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * The full-detail data a time-series chart carries (in its spec's `usermeta`) so the viewer can
 * re-reduce the visible x-range when the reader zooms: one x column and the y columns of its rows.
 */
export interface ChartFullSeries {
  /** Field of the rows that holds x (e.g. "t"). */
  xField: string;
  x: number[];
  /** Each series: the field its y goes in, its values (null = missing) and constant fields of its rows (e.g. the device). */
  series: { yField: string; values: (number | null)[]; fields?: Record<string, string> }[];
  /** Points per series the chart draws at most. */
  maxPoints: number;
}

/** The key under `usermeta` where a chart spec keeps its {@link ChartFullSeries}. */
export const FULL_SERIES_KEY = 'cogbookFullSeries';

/**
 * The chart rows for the x-range `[x0, x1]` from the full data: each series reduced over that
 * range alone ({@link reduceRange}), in the row shape of the chart that carried it.
 *
 * @example rowsForRange(spec.usermeta.cogbookFullSeries, 600, 660) // original samples of that minute
 */
export function rowsForRange(full: ChartFullSeries, x0: number, x1: number): ChartRow[] {
  const rows: ChartRow[] = [];
  for (const s of full.series) {
    const y = s.values.map((v) => (v === null ? NaN : v));
    const r = reduceRange(full.x, y, x0, x1, full.maxPoints);
    for (let i = 0; i < r.x.length; i++) rows.push({ [full.xField]: r.x[i]!, [s.yField]: finiteOrNull(r.y[i]!), ...s.fields });
  }
  return rows;
}

/** The full series to attach when a series is longer than the chart draws (else there is nothing to refine). */
export function fullSeriesIfReduced(full: ChartFullSeries): { usermeta: Record<string, ChartFullSeries> } | Record<string, never> {
  return full.x.length > full.maxPoints ? { usermeta: { [FULL_SERIES_KEY]: full } } : {};
}
