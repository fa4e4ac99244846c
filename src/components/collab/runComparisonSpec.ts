import type { RunCompareRow } from '../../../shared/api/runs.js';
import { VEGA_LITE_SCHEMA } from '../../../shared/charts/chart-common.js';
import { deviceColour } from '../../../shared/charts/palette.js';
import type { TopLevelSpec } from '../../../shared/charts/spec.js';
import { formatDateTime } from '@/utils/time';

/** How a run is named in comparisons: its label, else when it ran. */
export function runName(row: Pick<RunCompareRow, 'label' | 'createdAt'>): string {
  return row.label?.trim() || formatDateTime(row.createdAt);
}

/** A run's place in the comparison: "1 · Morning ride" so equal labels stay apart and in order. */
function runKey(row: RunCompareRow, index: number): string {
  return `${index + 1} · ${runName(row)}`;
}

/**
 * One output across runs as a small vega-lite chart: a point per run (oldest first)
 * joined by a line, the run on the x axis in order. Runs without a number are left
 * out of the marks but keep their place on the axis, so a failed run shows as a gap.
 */
export function runComparisonSpec(path: string, rows: readonly RunCompareRow[], unit?: string): TopLevelSpec {
  const order = rows.map(runKey);
  const values = rows.flatMap((row, i) => (typeof row.value === 'number' && Number.isFinite(row.value) ? [{ run: order[i]!, value: row.value, revision: row.revision }] : []));
  const title = unit ? `${path} (${unit})` : path;
  return {
    $schema: VEGA_LITE_SCHEMA,
    width: 'container',
    height: 180,
    data: { values },
    encoding: {
      x: { field: 'run', type: 'ordinal', sort: order, scale: { domain: order }, axis: { title: null, labelAngle: 0, labelLimit: 140 } },
      y: { field: 'value', type: 'quantitative', title, scale: { zero: false } },
      tooltip: [
        { field: 'run', type: 'nominal', title: 'Run' },
        { field: 'value', type: 'quantitative', title, format: '.4~g' },
        { field: 'revision', type: 'quantitative', title: 'Revision' },
      ],
    },
    layer: [
      { mark: { type: 'line', color: deviceColour(0), strokeWidth: 1.5 } },
      { mark: { type: 'point', filled: true, size: 70, color: deviceColour(0) } },
    ],
  } as TopLevelSpec;
}
