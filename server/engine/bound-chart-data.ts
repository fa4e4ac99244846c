import { SNAPSHOT_CHART_MAX_ROWS } from '../../shared/api/snapshots.js';
import { FULL_SERIES_KEY } from '../../shared/charts/reduce-range.js';

/**
 * Caps every inline dataset of a vega-lite spec (`datasets.*`, and `data.values` at
 * any depth) at `maxRows` rows by taking every k-th row. The chart builders already
 * reduce series to about 2000 points keeping peaks; this is the backstop for
 * hand-written specs so no snapshot grows without bound. The full series a long time-series
 * chart carries for zooming in the editor (`usermeta`) is left out for the same reason.
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
      } else if (k === 'usermeta' && typeof v === 'object' && v !== null && FULL_SERIES_KEY in v) {
        const { [FULL_SERIES_KEY]: _full, ...rest } = v as Record<string, unknown>;
        void _full;
        if (Object.keys(rest).length > 0) out[k] = walk(rest, depth + 1);
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
