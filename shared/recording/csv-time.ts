import { parseDecimal } from './parse-decimal.js';

/** How a CSV time cell is written. */
export type CsvTimeFormat = 'seconds' | 'clock' | 'iso';

const CLOCK = /^(\d+):(\d{1,2})(?::(\d{1,2}(?:\.\d+)?))?$/;
const ISO = /^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})?$/i;
const HAS_ZONE = /(Z|[+-]\d{2}:?\d{2})$/i;

/** The format of one time cell, or undefined when it is none of them. */
export function detectTimeFormat(cell: string): CsvTimeFormat | undefined {
  const c = cell.trim();
  if (c === '') return undefined;
  if (Number.isFinite(Number(c))) return 'seconds';
  if (CLOCK.test(c)) return 'clock';
  if (ISO.test(c) && !Number.isNaN(Date.parse(withZone(c)))) return 'iso';
  return undefined;
}

/** True when an ISO cell carries no zone (read as UTC, so the result does not depend on the host). */
export function isoLacksZone(cell: string): boolean {
  return !HAS_ZONE.test(cell.trim());
}

/**
 * Reads a time cell: seconds for 'seconds' and 'clock' (h:mm:ss or mm:ss, fractions allowed),
 * ms since the Unix epoch for 'iso' (no zone = UTC). NaN when unreadable.
 */
export function parseTimeCell(cell: string, format: CsvTimeFormat): number {
  if (format === 'seconds') return parseDecimal(cell);
  const c = cell.trim();
  if (c === '') return NaN;
  if (format === 'clock') {
    const m = CLOCK.exec(c);
    if (!m) return NaN;
    // With three parts the first is hours; with two it is minutes:seconds.
    return m[3] === undefined ? Number(m[1]) * 60 + Number(m[2]) : Number(m[1]) * 3600 + Number(m[2]) * 60 + Number(m[3]);
  }
  return ISO.test(c) ? Date.parse(withZone(c)) : NaN;
}

function withZone(c: string): string {
  const t = c.replace(' ', 'T');
  return HAS_ZONE.test(t) ? t : `${t}Z`;
}
