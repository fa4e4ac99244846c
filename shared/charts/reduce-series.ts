/** A series after display reduction: x ascending as given, y at those x. */
export interface ReducedSeries {
  x: Float64Array;
  y: Float64Array;
}

/**
 * Thins a series to at most `maxPoints` points for drawing, keeping for each bucket of
 * consecutive samples its lowest and highest y (in x order), so peaks and dips survive
 * where averaging or plain decimation would shave them. A bucket with no finite y keeps
 * one NaN point, so a dropout still shows as a gap. Series that already fit are copied.
 * O(n).
 *
 * @example
 * reduceForDisplay(time, power, 2000) // a 4 h 1 s ride -> 2000 points, sprint peak kept
 */
export function reduceForDisplay(x: ArrayLike<number>, y: ArrayLike<number>, maxPoints: number): ReducedSeries {
  const n = Math.min(x.length, y.length);
  const limit = Math.max(2, Math.floor(maxPoints));
  if (n <= limit) return { x: Float64Array.from({ length: n }, (_, i) => x[i]!), y: Float64Array.from({ length: n }, (_, i) => y[i]!) };
  const buckets = Math.floor(limit / 2);
  const outX: number[] = [];
  const outY: number[] = [];
  for (let b = 0; b < buckets; b++) {
    const from = Math.floor((b * n) / buckets);
    const to = Math.floor(((b + 1) * n) / buckets);
    let lo = -1;
    let hi = -1;
    for (let i = from; i < to; i++) {
      const v = y[i]!;
      if (!Number.isFinite(v)) continue;
      if (lo < 0 || v < y[lo]!) lo = i;
      if (hi < 0 || v > y[hi]!) hi = i;
    }
    if (lo < 0) {
      outX.push(x[from]!);
      outY.push(NaN);
      continue;
    }
    for (const i of lo === hi ? [lo] : lo < hi ? [lo, hi] : [hi, lo]) {
      outX.push(x[i]!);
      outY.push(y[i]!);
    }
  }
  return { x: Float64Array.from(outX), y: Float64Array.from(outY) };
}
