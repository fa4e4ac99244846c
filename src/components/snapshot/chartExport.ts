/** Saving what a stored chart shows, without the chart library. */

/** Starts a download of `url` as `fileName`. */
export function downloadUrl(url: string, fileName: string): void {
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  a.rel = 'noopener';
  a.click();
}

/** One CSV field: empty for missing or non-finite numbers, quoted when it holds a quote, comma or line break. */
export function csvCell(v: unknown): string {
  if (v === null || v === undefined || (typeof v === 'number' && !Number.isFinite(v))) return '';
  const s = String(v);
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** Every inline dataset of a vega-lite spec: `data.values` at any depth and each of `datasets`. */
function inlineDatasets(spec: unknown): unknown[][] {
  const found: unknown[][] = [];
  const walk = (node: unknown, depth: number): void => {
    if (depth > 32 || typeof node !== 'object' || node === null) return;
    if (Array.isArray(node)) return node.forEach((x) => walk(x, depth + 1));
    for (const [k, v] of Object.entries(node)) {
      if (k === 'datasets' && typeof v === 'object' && v !== null) {
        for (const rows of Object.values(v)) if (Array.isArray(rows)) found.push(rows);
      } else if (k === 'data' && typeof v === 'object' && v !== null && Array.isArray((v as { values?: unknown }).values)) {
        found.push((v as { values: unknown[] }).values);
      } else walk(v, depth + 1);
    }
  };
  walk(spec, 0);
  return found;
}

/**
 * The chart's data rows as CSV: its largest inline dataset, one column per plain field, as the
 * live chart view's "Chart data (CSV)" gives them.
 */
export function chartDataCsv(spec: Record<string, unknown>): string {
  const sets = inlineDatasets(spec).filter((rows) => rows.length > 0);
  const rows = (sets.sort((a, b) => b.length - a.length)[0] ?? []).filter((r): r is Record<string, unknown> => typeof r === 'object' && r !== null);
  const fields = [...new Set(rows.flatMap((r) => Object.keys(r).filter((k) => typeof r[k] !== 'object' || r[k] === null)))];
  return [fields.join(','), ...rows.map((r) => fields.map((f) => csvCell(r[f])).join(','))].join('\n') + '\n';
}
