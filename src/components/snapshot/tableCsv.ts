import type { SnapshotTableResult } from './snapshotTypes';

function cell(v: unknown): string {
  if (v === null || v === undefined || (typeof v === 'number' && !Number.isFinite(v))) return '';
  const s = String(v);
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Rows of strings/numbers as CSV (RFC 4180 quoting; missing numbers left empty). */
export function toCsv(header: readonly string[], rows: readonly (readonly unknown[])[]): string {
  return [header.map(cell).join(','), ...rows.map((r) => r.map(cell).join(','))].join('\r\n') + '\r\n';
}

/**
 * What a snapshot keeps of a table's columns, as CSV: one row per column with its
 * count, missing samples, mean, minimum and maximum.
 */
export function tableSummaryCsv(result: SnapshotTableResult): string {
  return toCsv(
    ['column', 'values', 'missing', 'mean', 'min', 'max'],
    result.table.columns.map((c) => [c.name, c.n, c.missing, c.mean, c.min, c.max]),
  );
}

/** The first rows a snapshot keeps of a table, as CSV (time, then each column). */
export function tableHeadCsv(result: SnapshotTableResult): string {
  return toCsv(result.head.columns, result.head.rows);
}

/** Hands a text to the browser as a file download. */
export function downloadText(text: string, fileName: string, type: string): void {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  a.click();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
