/** The p-th percentile (0..100) by the nearest-rank rule: a value that was measured; NaN for none. */
export function percentile(values: readonly number[], p: number): number {
  if (values.length === 0) return NaN;
  const s = [...values].sort((a, b) => a - b);
  const rank = Math.ceil((p / 100) * s.length);
  return s[Math.min(s.length, Math.max(1, rank)) - 1]!;
}

/** Whole milliseconds for a note. */
export function ms(x: number): string {
  return Number.isFinite(x) ? `${Math.round(x)} ms` : '-';
}
