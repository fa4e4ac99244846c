import { SNAPSHOT_TABLE_HEAD_ROWS, type Snapshot, type SnapshotCell, type SnapshotInput, type SnapshotResult } from '../../shared/api/snapshots.js';
import type { NotebookDocument } from '../../shared/notebook/document.js';
import type { CellOutput } from '../../shared/notebook/cell-output.js';
import type { RunNotebookResult } from '../../shared/notebook/run-notebook.js';
import type { Table } from '../../shared/engine/table.js';
import { boundChartData } from './bound-chart-data.js';
import { jsonSafe } from './json-safe.js';

/**
 * Turns a run into a snapshot readers can be served: per cell its state, numbers,
 * table statistics with the first rows, chart specs with bounded inline data, notes,
 * errors and warnings, all JSON-safe. Cells follow the document's order.
 */
export function buildSnapshot(
  document: NotebookDocument,
  run: RunNotebookResult,
  info: { revision: number; computedAt: string; durationMs: number; inputs: SnapshotInput[] },
): Snapshot {
  const cells = document.cells.map((cell): SnapshotCell => {
    const output = run.outputs[cell.id];
    if (!output) {
      return { cellId: cell.id, name: cell.name, kind: cell.kind, state: 'blocked', durationMs: 0, warnings: [], blockedBy: { name: cell.name, reason: 'failed' } };
    }
    const value = run.cache.entries[cell.id]?.value;
    return snapshotCell(output, value?.kind === 'table' ? value.table : undefined);
  });
  return { snapshotVersion: 1, revision: info.revision, computedAt: info.computedAt, durationMs: Math.round(info.durationMs), inputs: info.inputs, cells };
}

function snapshotCell(output: CellOutput, table: Table | undefined): SnapshotCell {
  const state = output.state === 'fresh' || output.state === 'failed' ? output.state : 'blocked';
  const cell: SnapshotCell = {
    cellId: output.cellId,
    name: output.name,
    kind: output.kind,
    state,
    durationMs: Math.round(output.durationMs),
    warnings: output.warnings.map((w) => jsonSafe(w) as SnapshotCell['warnings'][number]),
  };
  if (output.error) cell.error = jsonSafe(output.error) as NonNullable<SnapshotCell['error']>;
  if (output.blockedBy) cell.blockedBy = output.blockedBy;
  if (output.result && state === 'fresh') cell.result = snapshotResult(output.result, table);
  return cell;
}

function snapshotResult(result: NonNullable<CellOutput['result']>, table: Table | undefined): SnapshotResult {
  switch (result.type) {
    case 'recording': {
      const { warnings: _warnings, ...rest } = result.recording;
      return { type: 'recording', recording: jsonSafe(rest) as Extract<SnapshotResult, { type: 'recording' }>['recording'] };
    }
    case 'table':
      return {
        type: 'table',
        table: jsonSafe(result.table) as Extract<SnapshotResult, { type: 'table' }>['table'],
        head: table ? headOf(table) : { columns: [], rows: [] },
      };
    case 'values': {
      const out: Extract<SnapshotResult, { type: 'values' }> = { type: 'values', values: jsonSafe(result.values) as Record<string, never> };
      if (result.last !== undefined) out.last = jsonSafe(result.last) as never;
      return out;
    }
    case 'chart':
      return { type: 'chart', spec: boundChartData(jsonSafe(result.spec) as Record<string, unknown>) };
    case 'note':
      return { type: 'note', markdown: result.markdown };
  }
}

function headOf(table: Table): { columns: string[]; rows: (number | null)[][] } {
  const names = Object.keys(table.columns);
  const n = Math.min(SNAPSHOT_TABLE_HEAD_ROWS, table.timeS.length);
  const rows: (number | null)[][] = [];
  const finite = (x: number | undefined) => (x !== undefined && Number.isFinite(x) ? x : null);
  for (let i = 0; i < n; i++) rows.push([finite(table.timeS[i]), ...names.map((k) => finite(table.columns[k]![i]))]);
  return { columns: ['time', ...names], rows };
}
