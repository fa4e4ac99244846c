import { blandAltman } from '../engine/stats/bland-altman.js';
import { reduceForDisplay } from './reduce-series.js';
import { DEFAULT_MAX_POINTS, VEGA_LITE_SCHEMA, type ChartDevice } from './chart-common.js';
import { deviceColour } from './palette.js';
import type { ChartRow, TopLevelSpec } from './spec.js';

/** Input of {@link blandAltmanSpec}. */
export interface BlandAltmanInput {
  reference: ArrayLike<number>;
  test: ArrayLike<number>;
  device: ChartDevice;
  title?: string;
  unit?: string;
  maxPoints?: number;
}

/**
 * Bland-Altman plot: difference (test - reference) against the mean of the two, with
 * rules at the bias and at the 95% limits of agreement (Bland & Altman, 1986) computed
 * on every pair.
 */
export function blandAltmanSpec(input: BlandAltmanInput): TopLevelSpec {
  const n = Math.min(input.reference.length, input.test.length);
  const ba = blandAltman(Array.from({ length: n }, (_, i) => input.test[i]!), Array.from({ length: n }, (_, i) => input.reference[i]!));
  const pairs: { mean: number; diff: number }[] = [];
  for (let i = 0; i < n; i++) {
    const t = input.test[i]!;
    const r = input.reference[i]!;
    if (Number.isFinite(t) && Number.isFinite(r)) pairs.push({ mean: (t + r) / 2, diff: t - r });
  }
  pairs.sort((a, b) => a.mean - b.mean);
  const reduced = reduceForDisplay(pairs.map((p) => p.mean), pairs.map((p) => p.diff), input.maxPoints ?? DEFAULT_MAX_POINTS);
  const points: ChartRow[] = Array.from(reduced.x, (m, i) => ({ mean: m, diff: reduced.y[i]! }));
  const unit = input.unit ?? 'W';
  const lines: ChartRow[] = [
    { line: 'bias', value: ba.biasW },
    { line: 'lower limit', value: ba.loaLowW },
    { line: 'upper limit', value: ba.loaHighW },
  ].filter((l) => Number.isFinite(l.value));
  return {
    $schema: VEGA_LITE_SCHEMA,
    ...(input.title ? { title: input.title } : {}),
    width: 'container',
    usermeta: { agreement: { n: ba.n, bias: ba.biasW, lower: ba.loaLowW, upper: ba.loaHighW } },
    layer: [
      {
        data: { values: points },
        mark: { type: 'point', size: 8, opacity: 0.4, filled: true, color: deviceColour(input.device.colourIndex) },
        encoding: {
          x: { field: 'mean', type: 'quantitative', title: `Mean of both (${unit})`, scale: { zero: false } },
          y: { field: 'diff', type: 'quantitative', title: `${input.device.label} - reference (${unit})` },
        },
      },
      {
        data: { values: lines },
        mark: { type: 'rule', color: '#333333' },
        encoding: {
          y: { field: 'value', type: 'quantitative' },
          strokeDash: { field: 'line', type: 'nominal', title: null, scale: { domain: ['bias', 'lower limit', 'upper limit'], range: [[1, 0], [4, 4], [4, 4]] } },
        },
      },
    ],
  };
}
