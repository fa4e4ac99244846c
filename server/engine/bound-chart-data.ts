import { SNAPSHOT_CHART_MAX_ROWS } from '../../shared/api/snapshots.js';

/**
 * Caps every inline dataset of a vega-lite spec (`datasets.*`, and `data.values` at
 * any depth) at `maxRows` rows by taking every k-th row. The chart builders already
 * reduce series to about 2000 points keeping peaks; this is the backstop for
 * hand-written specs so no snapshot grows without bound.
 */
export function boundChartData(spec: Record<string, unknown>, maxRows = SNAPSHOT_CHART_MAX_ROWS): Record<string, unknown> {
  const walk = (node: unknown, depth: number): unknown => {
    if (depth > 32 || typeof node !== 'object' || node === null) return node;
    if (Array.isArray(node)) return node.map((x) => walk(x, depth + 1));
    const out: Record<string, unknown> = {};
    for (const [k, v] of Object.entries(node)) {
      if (k === 'datasets' && typeof v === 'object' && v !== null && !Array.isArray(v)) {
        out[k] = Object.fromEntries(Object.entries(v).map(([name, rows]) => [name, Array.isArray(rows) ? thin(rows, maxRows) : rows]));
      } else if (k === 'data' && typeof v === 'object' && v !== null && Array.isArray((v as { values?: unknown }).values)) {
        out[k] = { ...v, values: thin((v as { values: unknown[] }).values, maxRows) };
      } else out[k] = walk(v, depth + 1);
    }
    return out;
  };
  return walk(spec, 0) as Record<string, unknown>;
}

function thin<T>(rows: T[], maxRows: number): T[] {
  if (rows.length <= maxRows) return rows;
  const step = Math.ceil(rows.length / maxRows);
  return rows.filter((_, i) => i % step === 0);
}
