import { EngineError } from '../errors.js';
import { barsToleranceSpec } from '../charts/bars-tolerance.js';
import { blandAltmanSpec } from '../charts/bland-altman.js';
import { DEFAULT_MAX_POINTS, type ChartDevice } from '../charts/chart-common.js';
import { differenceSpec } from '../charts/difference.js';
import { leftRightSpec } from '../charts/left-right.js';
import { scatterIdentitySpec } from '../charts/scatter-identity.js';
import type { ChartRow, TopLevelSpec } from '../charts/spec.js';
import { tracesSpec } from '../charts/traces.js';
import { validateUserSpec } from '../charts/validate-user-spec.js';
import { isQuantity, type FormulaValue } from '../formula/formula-value.js';
import type { ChartConfig } from './cell-config.js';
import type { NotebookSlot } from './document.js';

type Bound = Record<string, FormulaValue | undefined>;

function numbers(v: FormulaValue | undefined, binding: string, cell: string): Float64Array {
  if (v instanceof Float64Array) return v;
  if (typeof v === 'number') return Float64Array.of(v);
  if (Array.isArray(v) && v.every((x) => typeof x === 'number' || x === null)) return Float64Array.from(v, (x) => (x === null ? NaN : (x as number)));
  throw new EngineError('chart_binding', `chart binding "${binding}" must give a list of numbers`, { cell, field: binding });
}

function scalar(v: FormulaValue | undefined, binding: string, cell: string): number {
  const x = isQuantity(v) ? v.value : v;
  if (typeof x !== 'number') throw new EngineError('chart_binding', `chart binding "${binding}" must give one number`, { cell, field: binding });
  return x;
}

function strings(v: FormulaValue | undefined, n: number): string[] {
  if (v instanceof Float64Array) return Array.from(v, String);
  if (Array.isArray(v)) return v.map((x) => String(x));
  return Array.from({ length: n }, (_, i) => String(i + 1));
}

/** A device's colour follows its slot: a label equal to a slot's name or label takes that slot's place. */
function device(label: string, fallback: number, slots: readonly NotebookSlot[]): ChartDevice {
  const key = label.toLowerCase();
  const i = slots.findIndex((s) => s.name.toLowerCase() === key || s.label.toLowerCase() === key);
  return { label, colourIndex: i >= 0 ? i : fallback };
}

/** Rows for a hand-written spec: one field per list binding, thinned by stride past the point budget. */
function rowsOf(bound: Bound): ChartRow[] {
  const lists = Object.entries(bound).filter(([, v]) => v instanceof Float64Array || Array.isArray(v)) as [string, ArrayLike<unknown>][];
  const n = Math.max(0, ...lists.map(([, v]) => v.length));
  const step = Math.max(1, Math.ceil(n / DEFAULT_MAX_POINTS));
  const rows: ChartRow[] = [];
  for (let i = 0; i < n; i += step) {
    const row: ChartRow = {};
    for (const [k, v] of lists) {
      const x = v[i];
      row[k] = typeof x === 'number' ? (Number.isFinite(x) ? x : null) : typeof x === 'string' || typeof x === 'boolean' ? x : null;
    }
    rows.push(row);
  }
  return rows;
}

/**
 * Builds a chart cell's spec from its evaluated bindings: the preset's builder, or the
 * hand-written spec (checked first) with the bindings supplied as the dataset "cells".
 *
 * @throws EngineError `chart_binding` (names the binding), `chart_spec_invalid`.
 */
export function buildChart(config: ChartConfig, bound: Bound, slots: readonly NotebookSlot[], cell: string): TopLevelSpec {
  const labels = config.labels ?? [];
  const title = config.title;
  if (config.spec !== undefined) {
    const checked = validateUserSpec(config.spec);
    if (!checked.ok) throw new EngineError(checked.error.code, checked.error.message, { cell, field: 'spec' });
    const spec = { ...checked.spec, datasets: { ...(checked.spec as { datasets?: object }).datasets, cells: rowsOf(bound) } };
    return ('data' in spec ? spec : { ...spec, data: { name: 'cells' } }) as TopLevelSpec;
  }
  const num = (b: string) => numbers(bound[b], b, cell);
  const opt = (t: string | undefined) => (t ? { title: t } : {});
  switch (config.preset) {
    case 'traces': {
      const keys = ['y1', 'y2', 'y3', 'y4'].filter((k) => bound[k] !== undefined);
      const series = keys.map((k, i) => ({ ...device(labels[i] ?? config.bindings[k] ?? k, i, slots), values: num(k) }));
      return tracesSpec({ timeS: num('x'), series, ...opt(title) });
    }
    case 'difference':
      return differenceSpec({ timeS: num('x'), test: num('test'), reference: num('ref'), device: device(labels[0] ?? 'Device under test', 1, slots), ...opt(title) });
    case 'scatter':
      return scatterIdentitySpec({ reference: num('ref'), test: num('test'), device: device(labels[0] ?? 'Device under test', 1, slots), ...opt(title) });
    case 'bland-altman':
      return blandAltmanSpec({ reference: num('ref'), test: num('test'), device: device(labels[0] ?? 'Device under test', 1, slots), ...opt(title) });
    case 'bars-tolerance': {
      const values = num('values');
      const names = strings(bound['labels'], values.length);
      const groups = bound['groups'] === undefined ? undefined : strings(bound['groups'], values.length);
      const bars = Array.from(values, (valuePct, i) => ({ label: names[i] ?? String(i + 1), valuePct, ...(groups ? { group: groups[i]! } : {}) }));
      const devices = [...new Set(bars.map((b) => b.group ?? labels[0] ?? 'device'))].map((g, i) => device(g, i + 1, slots));
      return barsToleranceSpec({ bars: bars.map((b) => ({ ...b, group: b.group ?? devices[0]!.label })), tolerancePct: scalar(bound['tolerance'], 'tolerance', cell), devices, ...opt(title) });
    }
    case 'left-right': {
      const left = num('left');
      return leftRightSpec({ labels: strings(bound['labels'], left.length), leftPct: left, rightPct: num('right'), tolerancePct: scalar(bound['tolerance'], 'tolerance', cell), ...opt(title) });
    }
  }
}
