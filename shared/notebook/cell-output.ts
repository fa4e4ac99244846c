import type { EngineErrorData, EngineWarning } from '../errors.js';
import type { Segment } from '../engine/segment.js';
import type { Table } from '../engine/table.js';
import { summary } from '../engine/stats/summary.js';
import type { TopLevelSpec } from '../charts/spec.js';
import type { FormulaValue } from '../formula/formula-value.js';
import type { Recording, RecordingMeta } from '../recording/recording.js';
import type { CellKind } from './document.js';
import type { CellValue } from './cell-value.js';

/**
 * Where a cell stands. `fresh`: its output matches its config and inputs; `stale`:
 * something it depends on changed since (set by the host, before a run); `running`;
 * `failed`: it raised an error; `blocked`: it waits on a failed cell or an empty slot.
 */
export type CellState = 'fresh' | 'stale' | 'running' | 'failed' | 'blocked';

/** Count, missing and range of one column. */
export interface ColumnSummary {
  name: string;
  n: number;
  missing: number;
  mean: number;
  min: number;
  max: number;
}

/** A table as the UI shows it (the columns themselves stay in the worker). */
export interface TableSummary {
  rows: number;
  startS: number;
  endS: number;
  intervalS?: number;
  columns: ColumnSummary[];
  segments?: Segment[];
  facts?: Record<string, number | string>;
}

/** A recording as the UI shows it. */
export interface RecordingSummary {
  meta: RecordingMeta;
  rows: number;
  columns: ColumnSummary[];
  laps: number;
  gearChanges: number;
  warnings: EngineWarning[];
}

/** A long list shown by its summary and first entries. */
export interface ListSummary {
  list: true;
  length: number;
  n: number;
  mean: number;
  min: number;
  max: number;
  head: (number | null)[];
}

/** A formula value as shown: small values as they are, long lists summarised. */
export type ShownValue = FormulaValue | ListSummary | { [key: string]: ShownValue } | ShownValue[];

/** What a cell produced, by kind. */
export type CellResult =
  | { type: 'recording'; recording: RecordingSummary }
  | { type: 'table'; table: TableSummary }
  | { type: 'values'; values: Record<string, ShownValue>; last?: ShownValue }
  | { type: 'chart'; spec: TopLevelSpec }
  | { type: 'note'; markdown: string };

/** The outcome of one cell in a run: plain data, safe for postMessage and JSON. */
export interface CellOutput {
  cellId: string;
  name: string;
  kind: CellKind;
  state: CellState;
  /** Time spent computing it in this run, ms (0 when taken from the cache). */
  durationMs: number;
  /** True when the result was reused from an earlier run. */
  cached: boolean;
  result?: CellResult;
  error?: EngineErrorData;
  /** For `blocked`: the failed cell (or empty slot) it waits on. */
  blockedBy?: { cellId?: string; name: string; reason: 'failed' | 'empty_slot' };
  warnings: EngineWarning[];
}

/** Lists longer than this are summarised in outputs. */
const SHOW_LIST = 50;

function columnSummary(name: string, values: Float64Array): ColumnSummary {
  const s = summary(values);
  return { name, n: s.n, missing: values.length - s.n, mean: s.mean, min: s.min, max: s.max };
}

/** Summary of a table for display. */
export function summariseTable(table: Table, extra: { segments?: Segment[]; facts?: Record<string, number | string> } = {}): TableSummary {
  const t = table.timeS;
  const out: TableSummary = {
    rows: t.length,
    startS: t.length > 0 ? t[0]! : NaN,
    endS: t.length > 0 ? t[t.length - 1]! : NaN,
    columns: Object.entries(table.columns).map(([k, v]) => columnSummary(k, v)),
  };
  if (table.meta?.intervalS !== undefined) out.intervalS = table.meta.intervalS;
  if (extra.segments) out.segments = extra.segments;
  if (extra.facts) out.facts = extra.facts;
  return out;
}

function summariseRecording(r: Recording): RecordingSummary {
  return {
    meta: r.meta,
    rows: r.time.length,
    columns: Object.entries(r.columns).flatMap(([k, v]) => (v ? [columnSummary(k, v)] : [])),
    laps: r.events.filter((e) => e.kind === 'lap').length,
    gearChanges: r.events.filter((e) => e.kind === 'gear').length,
    warnings: r.warnings,
  };
}

/** A formula value for display: long lists become {@link ListSummary}. */
export function showValue(v: FormulaValue): ShownValue {
  if (v instanceof Float64Array) {
    if (v.length <= SHOW_LIST) return v;
    const s = summary(v);
    const head = Array.from(v.subarray(0, 10), (x) => (Number.isFinite(x) ? x : null));
    return { list: true, length: v.length, n: s.n, mean: s.mean, min: s.min, max: s.max, head };
  }
  if (Array.isArray(v)) return v.length <= SHOW_LIST ? v.map(showValue) : [...v.slice(0, SHOW_LIST).map(showValue)];
  if (typeof v === 'object' && v !== null && !('quantity' in v)) {
    const out: Record<string, ShownValue> = {};
    for (const [k, x] of Object.entries(v)) out[k] = showValue(x);
    return out;
  }
  return v;
}

/** The display form of a cell's value. */
export function resultOf(value: CellValue): CellResult {
  switch (value.kind) {
    case 'recording':
      return { type: 'recording', recording: summariseRecording(value.recording) };
    case 'table': {
      const extra: { segments?: Segment[]; facts?: Record<string, number | string> } = {};
      if (value.segments) extra.segments = value.segments;
      if (value.facts) extra.facts = value.facts;
      return { type: 'table', table: summariseTable(value.table, extra) };
    }
    case 'values': {
      const values: Record<string, ShownValue> = {};
      for (const [k, v] of Object.entries(value.values)) values[k] = showValue(v);
      return value.last === undefined ? { type: 'values', values } : { type: 'values', values, last: showValue(value.last) };
    }
    case 'chart':
      return { type: 'chart', spec: value.spec };
    case 'note':
      return { type: 'note', markdown: value.markdown };
  }
}
