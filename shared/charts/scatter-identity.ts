import { olsFit } from '../engine/stats/ols-fit.js';
import { reduceForDisplay } from './reduce-series.js';
import { DEFAULT_MAX_POINTS, VEGA_LITE_SCHEMA, type ChartDevice } from './chart-common.js';
import { deviceColour } from './palette.js';
import type { ChartRow, TopLevelSpec } from './spec.js';

/** Input of {@link scatterIdentitySpec}. */
export interface ScatterIdentityInput {
  reference: ArrayLike<number>;
  test: ArrayLike<number>;
  device: ChartDevice;
  title?: string;
  unit?: string;
  maxPoints?: number;
}

/**
 * Device under test against the reference, one point per paired sample, with the
 * identity line (perfect agreement) and the least-squares line of test on reference
 * computed on every pair (the plotted points may be thinned, the fit is not).
 */
export function scatterIdentitySpec(input: ScatterIdentityInput): TopLevelSpec {
  const n = Math.min(input.reference.length, input.test.length);
  const fit = olsFit(Array.from({ length: n }, (_, i) => input.reference[i]!), Array.from({ length: n }, (_, i) => input.test[i]!));
  let lo = Infinity;
  let hi = -Infinity;
  const points: ChartRow[] = [];
  // Thin by reference order so the cloud's extremes survive.
  const order = Array.from({ length: n }, (_, i) => i).filter((i) => Number.isFinite(input.reference[i]!) && Number.isFinite(input.test[i]!));
  order.sort((a, b) => input.reference[a]! - input.reference[b]!);
  const r = reduceForDisplay(order.map((i) => input.reference[i]!), order.map((i) => input.test[i]!), input.maxPoints ?? DEFAULT_MAX_POINTS);
  for (let i = 0; i < r.x.length; i++) {
    points.push({ ref: r.x[i]!, test: r.y[i]! });
    lo = Math.min(lo, r.x[i]!, r.y[i]!);
    hi = Math.max(hi, r.x[i]!, r.y[i]!);
  }
  if (!Number.isFinite(lo)) [lo, hi] = [0, 1];
  const unit = input.unit ?? 'W';
  const identity: ChartRow[] = [{ ref: lo, test: lo }, { ref: hi, test: hi }];
  const fitted: ChartRow[] = Number.isFinite(fit.slope)
    ? [{ ref: lo, test: fit.intercept + fit.slope * lo }, { ref: hi, test: fit.intercept + fit.slope * hi }]
    : [];
  const x = { field: 'ref', type: 'quantitative' as const, title: `Reference (${unit})`, scale: { zero: false } };
  const y = { field: 'test', type: 'quantitative' as const, title: `${input.device.label} (${unit})`, scale: { zero: false } };
  return {
    $schema: VEGA_LITE_SCHEMA,
    ...(input.title ? { title: input.title } : {}),
    width: 'container',
    usermeta: { fit: { slope: fit.slope, intercept: fit.intercept, r2: fit.r2, n: fit.n } },
    layer: [
      { data: { values: points }, mark: { type: 'point', size: 8, opacity: 0.4, filled: true, color: deviceColour(input.device.colourIndex) }, encoding: { x, y } },
      { data: { values: identity }, mark: { type: 'line', color: '#666666', strokeDash: [4, 4] }, encoding: { x, y } },
      { data: { values: fitted }, mark: { type: 'line', color: deviceColour(input.device.colourIndex) }, encoding: { x, y } },
    ],
  };
}
