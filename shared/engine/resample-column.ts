/** How {@link resampleColumn} reads the source between samples. */
export type ResampleMode = 'linear' | 'step';

/** Options of {@link resampleColumn}. */
export interface ResampleColumnOptions {
  /** Source time of the first grid point, seconds. */
  startS: number;
  /** Grid spacing, seconds (> 0). */
  intervalS: number;
  /** Number of grid points. */
  count: number;
  /** Longest gap between two finite source samples that may be bridged, seconds (default 3). */
  maxGapS?: number;
  /** 'linear' (default) for continuous values, 'step' to hold the last value (gear state). */
  mode?: ResampleMode;
  /** Source sample spacing, seconds; estimated from the time span when omitted. */
  sourceIntervalS?: number;
  /** Average a denser source over each grid bin (default true); false reads it at the grid time like a coarse one. */
  binMean?: boolean;
}

/**
 * Reads one column at regular grid times. O(n + m) with one moving pointer.
 *
 * - 'linear': when the source is at least as coarse as the grid, interpolates linearly
 *   between the two neighbouring samples, and gives NaN when either is NaN or they are
 *   more than `maxGapS` apart: a dropout is never bridged. When the source is denser
 *   than the grid (10 Hz onto 1 s), each grid point is the mean of the finite samples in
 *   its bin `[t - interval/2, t + interval/2)`, because picking one sample in ten would
 *   throw away most of the data and keep its noise.
 * - 'step': the value of the last sample at or before the grid time (NaN before the
 *   first sample and more than one grid step after the last).
 *
 * @example
 * resampleColumn(Float64Array.of(0, 2), Float64Array.of(100, 200), { startS: 0, intervalS: 1, count: 3 })
 * // [100, 150, 200]
 */
export function resampleColumn(time: Float64Array, values: Float64Array, options: ResampleColumnOptions): Float64Array {
  const { startS, intervalS, count } = options;
  const maxGapS = options.maxGapS ?? 3;
  const mode = options.mode ?? 'linear';
  const out = new Float64Array(Math.max(0, count)).fill(NaN);
  const n = time.length;
  if (n === 0 || count <= 0) return out;
  const sourceIntervalS = options.sourceIntervalS ?? (n > 1 ? (time[n - 1]! - time[0]!) / (n - 1) : intervalS);
  const eps = 1e-9 * Math.max(1, intervalS);
  if (mode === 'step') {
    let i = 0;
    const last = time[n - 1]! + intervalS;
    for (let k = 0; k < count; k++) {
      const t = startS + k * intervalS;
      if (t < time[0]! - eps || t > last) continue;
      while (i + 1 < n && time[i + 1]! <= t + eps) i++;
      out[k] = values[i]!;
    }
    return out;
  }
  if (options.binMean !== false && sourceIntervalS > 0 && sourceIntervalS < 0.75 * intervalS) {
    const half = intervalS / 2;
    let lo = 0;
    for (let k = 0; k < count; k++) {
      const t = startS + k * intervalS;
      while (lo < n && time[lo]! < t - half - eps) lo++;
      let sum = 0;
      let m = 0;
      for (let i = lo; i < n && time[i]! < t + half - eps; i++) {
        const value = values[i]!;
        if (Number.isFinite(value)) {
          sum += value;
          m++;
        }
      }
      if (m > 0) out[k] = sum / m;
    }
    return out;
  }
  let i = 0;
  for (let k = 0; k < count; k++) {
    const t = startS + k * intervalS;
    if (t < time[0]! - eps || t > time[n - 1]! + eps) continue;
    while (i + 1 < n && time[i + 1]! <= t + eps) i++;
    const t0 = time[i]!;
    const v0 = values[i]!;
    if (Math.abs(t - t0) <= eps) {
      out[k] = v0;
      continue;
    }
    if (i + 1 >= n) continue;
    const t1 = time[i + 1]!;
    const v1 = values[i + 1]!;
    if (!Number.isFinite(v0) || !Number.isFinite(v1) || t1 - t0 > maxGapS + eps) continue;
    out[k] = v0 + ((v1 - v0) * (t - t0)) / (t1 - t0);
  }
  return out;
}
