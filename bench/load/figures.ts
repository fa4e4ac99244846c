/** What one kind of request did during a load run. */
export interface LoadFigures {
  /** Requests answered (any status). */
  requests: number;
  /** Answered requests per second of the run. */
  perSecond: number;
  /** Latency percentiles, ms. */
  p50Ms: number;
  p99Ms: number;
  /** Connection errors and timeouts: no answer at all. */
  errors: number;
  /** Answers outside 200-299. */
  non2xx: number;
  /** Answers by status code, e.g. `{ "200": 9000 }`. */
  statuses: Record<string, number>;
  /** What the first few unanswered requests failed with, where the driver knows. */
  errorSamples?: string[];
}

/** Nearest-rank percentile (`p` in 0-100) of some numbers; NaN for none. */
export function percentile(values: readonly number[], p: number): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.ceil((p / 100) * sorted.length);
  return sorted[Math.min(sorted.length, Math.max(1, rank)) - 1]!;
}

/** One line for a log or an assertion message, e.g. `1234 req (411.3/s), p50 12 ms, p99 80 ms, 0 errors, 0 non-2xx`. */
export function describeFigures(f: LoadFigures): string {
  const odd = Object.entries(f.statuses).filter(([code]) => !code.startsWith('2'));
  return `${f.requests} req (${f.perSecond.toFixed(1)}/s), p50 ${f.p50Ms.toFixed(1)} ms, p99 ${f.p99Ms.toFixed(1)} ms, ${f.errors} errors${f.errorSamples?.length ? ` (${f.errorSamples.join('; ')})` : ''}, ${f.non2xx} non-2xx${odd.length > 0 ? ` (${odd.map(([c, n]) => `${c}: ${n}`).join(', ')})` : ''}`;
}
