import { fullSeriesIfReduced } from './reduce-range.js';
import { reduceForDisplay } from './reduce-series.js';
import { DEFAULT_MAX_POINTS, finiteOrNull, drawnOnce, type ChartDevice, VEGA_LITE_SCHEMA } from './chart-common.js';
import { deviceColour } from './palette.js';
import type { ChartRow, TopLevelSpec } from './spec.js';

/** Input of {@link differenceSpec}. */
export interface DifferenceInput {
  timeS: ArrayLike<number>;
  test: ArrayLike<number>;
  reference: ArrayLike<number>;
  /** The device under test (its colour draws the line). */
  device: ChartDevice;
  /** Show the difference in percent of the reference instead of W. */
  percent?: boolean;
  title?: string;
  maxPoints?: number;
}

/**
 * Difference of the device under test against the reference over time (W, or % of the
 * reference), with a rule at zero. Reduced for display with extremes kept.
 */
export function differenceSpec(input: DifferenceInput): TopLevelSpec {
  const n = Math.min(input.test.length, input.reference.length, input.timeS.length);
  const diff = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const d = input.test[i]! - input.reference[i]!;
    diff[i] = input.percent ? (100 * d) / input.reference[i]! : d;
  }
  const maxPoints = input.maxPoints ?? DEFAULT_MAX_POINTS;
  const r = reduceForDisplay(input.timeS, diff, maxPoints);
  const rows: ChartRow[] = Array.from(r.x, (t, i) => ({ t, diff: finiteOrNull(r.y[i]!) }));
  const unit = input.percent ? '%' : 'W';
  return {
    $schema: VEGA_LITE_SCHEMA,
    ...(input.title ? { title: input.title } : {}),
    width: 'container',
    data: { values: rows },
    // The full difference, so a zoomed view is drawn from the original samples (see ChartView).
    ...fullSeriesIfReduced({ xField: 't', x: Array.from(input.timeS).slice(0, n), series: [{ yField: 'diff', values: Array.from(diff, finiteOrNull) }], maxPoints }),
    layer: [
      { data: drawnOnce(), mark: { type: 'rule', color: '#666666' }, encoding: { y: { datum: 0 } } },
      {
        mark: { type: 'line', strokeWidth: 1, color: deviceColour(input.device.colourIndex) },
        encoding: {
          x: { field: 't', type: 'quantitative', title: 'Time (s)' },
          y: { field: 'diff', type: 'quantitative', title: `${input.device.label} - reference (${unit})` },
        },
      },
    ],
  };
}
