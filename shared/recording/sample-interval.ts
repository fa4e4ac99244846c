/**
 * Most common spacing between consecutive sample times, s (rounded to 1 ms to group float noise).
 * NaN for fewer than two samples.
 */
export function sampleInterval(time: Float64Array): number {
  const counts = new Map<number, number>();
  let best = NaN;
  let bestCount = 0;
  for (let i = 1; i < time.length; i++) {
    const d = Math.round((time[i]! - time[i - 1]!) * 1000);
    const c = (counts.get(d) ?? 0) + 1;
    counts.set(d, c);
    if (c > bestCount || (c === bestCount && d < best)) {
      bestCount = c;
      best = d;
    }
  }
  return best / 1000;
}
