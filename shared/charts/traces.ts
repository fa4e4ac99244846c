import { fullSeriesIfReduced } from './reduce-range.js';
import { reduceForDisplay } from './reduce-series.js';
import { DEFAULT_MAX_POINTS, VEGA_LITE_SCHEMA, deviceScale, finiteOrNull, type ChartDevice } from './chart-common.js';
import type { ChartRow, TopLevelSpec } from './spec.js';

/** Input of {@link tracesSpec}. */
export interface TracesInput {
  /** Time axis, seconds. */
  timeS: ArrayLike<number>;
  series: ReadonlyArray<ChartDevice & { values: ArrayLike<number> }>;
  title?: string;
  yTitle?: string;
  maxPoints?: number;
}

/**
 * Overlaid traces (e.g. power of every device over time), one line per device in its
 * own colour; each series is reduced for display with its peaks kept.
 *
 * @example tracesSpec({ timeS, series: [{ label: 'Reference', colourIndex: 0, values: refW }] })
 */
export function tracesSpec(input: TracesInput): TopLevelSpec {
  const rows: ChartRow[] = [];
  const maxPoints = input.maxPoints ?? DEFAULT_MAX_POINTS;
  for (const s of input.series) {
    const r = reduceForDisplay(input.timeS, s.values, maxPoints);
    for (let i = 0; i < r.x.length; i++) rows.push({ t: r.x[i]!, value: finiteOrNull(r.y[i]!), device: s.label });
  }
  return {
    $schema: VEGA_LITE_SCHEMA,
    ...(input.title ? { title: input.title } : {}),
    width: 'container',
    data: { values: rows },
    // The full series, so a zoomed view is drawn from the original samples (see ChartView).
    ...fullSeriesIfReduced({
      xField: 't',
      x: Array.from(input.timeS),
      series: input.series.map((s) => ({ yField: 'value', values: Array.from(s.values, finiteOrNull), fields: { device: s.label } })),
      maxPoints,
    }),
    mark: { type: 'line', strokeWidth: 1.2 },
    encoding: {
      x: { field: 't', type: 'quantitative', title: 'Time (s)' },
      y: { field: 'value', type: 'quantitative', title: input.yTitle ?? 'Power (W)' },
      color: { field: 'device', type: 'nominal', title: 'Device', scale: deviceScale(input.series) },
    },
  };
}
