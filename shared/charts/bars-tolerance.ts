import { deviceScale, finiteOrNull, drawnOnce, TOLERANCE_BAND_COLOUR, type ChartDevice, VEGA_LITE_SCHEMA } from './chart-common.js';
import type { ChartRow, TopLevelSpec } from './spec.js';

/** One bar: a percent difference for a block, leg or chainring. */
export interface ToleranceBar {
  /** What the bar stands for on the x axis, e.g. "Block 3", "50T". */
  label: string;
  valuePct: number;
  /** Device (or other group) the bar belongs to; bars of one label are side by side. */
  group?: string;
}

/** Input of {@link barsToleranceSpec}. */
export interface BarsToleranceInput {
  bars: readonly ToleranceBar[];
  /** Half-width of the tolerance band, percent (e.g. the combined tolerance). */
  tolerancePct: number;
  /** Colours of the groups; a group not listed gets the first device's colour. */
  devices?: readonly ChartDevice[];
  title?: string;
}

/**
 * Bars of percent difference (per block, leg or chainring) over a grey band at
 * +/- tolerance and a rule at zero: a bar leaving the band is a finding.
 */
export function barsToleranceSpec(input: BarsToleranceInput): TopLevelSpec {
  const rows: ChartRow[] = input.bars.map((b) => ({
    label: b.label,
    value: finiteOrNull(b.valuePct),
    group: b.group ?? 'device',
    outside: Math.abs(b.valuePct) > input.tolerancePct,
  }));
  const groups = [...new Set(rows.map((r) => String(r.group)))];
  const devices = input.devices ?? groups.map((label, colourIndex) => ({ label, colourIndex }));
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
          xOffset: { field: 'group', type: 'nominal' },
          y: { field: 'value', type: 'quantitative', title: 'Difference from reference (%)' },
          color: { field: 'group', type: 'nominal', title: 'Device', scale: deviceScale(devices) },
          stroke: { condition: { test: 'datum.outside', value: '#000000' }, value: null },
        },
      },
    ],
  };
}
