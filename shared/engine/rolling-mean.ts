/** Options of {@link rollingMean}. */
export interface RollingMeanOptions {
  /** 'trailing' (default): samples i-window+1..i; 'centred': the window around i. */
  align?: 'trailing' | 'centred';
  /** Fewest finite samples a window needs, else NaN (default 1). */
  minCount?: number;
}

/**
 * Mean over a sliding window of `window` samples, skipping NaN. Running sums: O(n)
 * whatever the window. On a 1 s grid, `window` is a number of seconds.
 *
 * @example
 * rollingMean(Float64Array.of(1, 2, NaN, 4), 2) // [1, 1.5, 2, 4]
 */
export function rollingMean(values: Float64Array, window: number, options: RollingMeanOptions = {}): Float64Array {
  const n = values.length;
  const w = Math.max(1, Math.floor(window));
  const minCount = Math.max(1, options.minCount ?? 1);
  // For a centred window the output at i covers [i - before, i + after].
  const before = options.align === 'centred' ? Math.floor((w - 1) / 2) : w - 1;
  const after = w - 1 - before;
  const out = new Float64Array(n);
  let sum = 0;
  let m = 0;
  let lo = 0;
  let hi = -1;
  for (let i = 0; i < n; i++) {
    const wantHi = Math.min(n - 1, i + after);
    while (hi < wantHi) {
      hi++;
      const value = values[hi]!;
      if (Number.isFinite(value)) {
        sum += value;
        m++;
      }
    }
    const wantLo = Math.max(0, i - before);
    while (lo < wantLo) {
      const value = values[lo]!;
      if (Number.isFinite(value)) {
        sum -= value;
        m--;
      }
      lo++;
    }
    if (m === 0) sum = 0; // drop rounding left over from earlier values
    out[i] = m >= minCount ? sum / m : NaN;
  }
  return out;
}
