import { finiteOrNull, LEG_COLOURS, drawnOnce, TOLERANCE_BAND_COLOUR, VEGA_LITE_SCHEMA } from './chart-common.js';
import type { ChartRow, TopLevelSpec } from './spec.js';

/** Input of {@link leftRightSpec}: per-leg percent differences for each label (block, chainring). */
export interface LeftRightInput {
  labels: readonly string[];
  leftPct: ArrayLike<number>;
  rightPct: ArrayLike<number>;
  tolerancePct: number;
  title?: string;
}

/**
 * Left and right leg side by side for each block or chainring, in the legs' fixed
 * colours, over the tolerance band: shows when an error sits on one leg only.
 */
export function leftRightSpec(input: LeftRightInput): TopLevelSpec {
  const rows: ChartRow[] = [];
  input.labels.forEach((label, i) => {
    rows.push({ label, leg: 'left', value: finiteOrNull(input.leftPct[i] ?? NaN) });
    rows.push({ label, leg: 'right', value: finiteOrNull(input.rightPct[i] ?? NaN) });
  });
  const tol = input.tolerancePct;
  return {
    $schema: VEGA_LITE_SCHEMA,
    ...(input.title ? { title: input.title } : {}),
    width: 'container',
    data: { values: rows },
    usermeta: { tolerancePct: tol },
    layer: [
      { data: drawnOnce(), mark: { type: 'rect', color: TOLERANCE_BAND_COLOUR, opacity: 0.35 }, encoding: { y: { datum: -tol }, y2: { datum: tol } } },
      { data: drawnOnce(), mark: { type: 'rule', color: '#666666' }, encoding: { y: { datum: 0 } } },
      {
        mark: { type: 'bar' },
        encoding: {
          x: { field: 'label', type: 'nominal', title: null, sort: null },
          xOffset: { field: 'leg', type: 'nominal', sort: ['left', 'right'] },
          y: { field: 'value', type: 'quantitative', title: 'Difference from reference (%)' },
          color: { field: 'leg', type: 'nominal', title: 'Leg', scale: { domain: ['left', 'right'], range: [LEG_COLOURS.left, LEG_COLOURS.right] } },
        },
      },
    ],
  };
}
