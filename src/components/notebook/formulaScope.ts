import type { CellOutput, ShownValue } from '../../../shared/notebook/cell-output.js';
import { snakeCase } from '../../../shared/notebook/cell-value.js';
import type { NotebookDocument } from '../../../shared/notebook/document.js';
import { assignedNames } from '../../../shared/notebook/stale-cells.js';
import type { ScopeName } from '@/composables/useMonaco';
import { formatNumber } from './format';

function describe(v: ShownValue | undefined): string {
  if (v === undefined) return 'not computed yet';
  if (typeof v === 'number') return formatNumber(v);
  if (typeof v === 'string' || typeof v === 'boolean') return JSON.stringify(v);
  if (v === null) return 'missing';
  if (v instanceof Float64Array || Array.isArray(v)) return `list of ${v.length}`;
  if (typeof v === 'object' && 'list' in v && v.list === true) return `list of ${String(v.length)}, mean ${formatNumber(v.mean as number)}`;
  if (typeof v === 'object' && 'quantity' in v && v.quantity === true) return `${formatNumber(v.value as number)} ${String(v.unit)}`;
  return `record: ${Object.keys(v).join(', ')}`;
}

/**
 * The names a formula in cell `cellId` can read, for completion and hover: every other
 * cell with its columns (tables, recordings) or values (formulas), the names formulas
 * assign, and the notebook's parameters.
 */
export function formulaScope(document: NotebookDocument, outputs: Record<string, CellOutput>, cellId: string): ScopeName[] {
  const out: ScopeName[] = [];
  for (const cell of document.cells) {
    if (cell.id === cellId || cell.kind === 'chart' || cell.kind === 'note') continue;
    const result = outputs[cell.id]?.result;
    if (result?.type === 'table') {
      const t = result.table;
      out.push({
        name: cell.name,
        kind: 'cell',
        detail: `table of ${t.rows.toLocaleString('en')} rows`,
        fields: [{ name: 'time', detail: 'seconds' }, ...t.columns.map((c) => ({ name: c.name, detail: `mean ${formatNumber(c.mean)}, ${c.missing} missing` }))],
      });
    } else if (result?.type === 'recording') {
      const r = result.recording;
      out.push({
        name: cell.name,
        kind: 'cell',
        detail: `recording ${r.meta.fileName}, ${r.rows.toLocaleString('en')} samples`,
        fields: [{ name: 'time', detail: 'seconds' }, ...r.columns.map((c) => ({ name: snakeCase(c.name), detail: `mean ${formatNumber(c.mean)}` }))],
      });
    } else if (result?.type === 'values') {
      const values = result.values;
      out.push({ name: cell.name, kind: 'cell', detail: 'formula results', fields: Object.keys(values).map((k) => ({ name: k, detail: describe(values[k]) })) });
      for (const [k, v] of Object.entries(values)) if (k !== cell.name) out.push({ name: k, kind: 'value', detail: `${describe(v)} (from ${cell.name})` });
    } else {
      out.push({ name: cell.name, kind: 'cell', detail: `${cell.kind} cell (not computed yet)` });
      if (cell.kind === 'formula') for (const n of assignedNames(cell.config.source)) out.push({ name: n, kind: 'value', detail: `from ${cell.name}` });
    }
  }
  for (const p of document.parameters) out.push({ name: p.name, kind: 'parameter', detail: `parameter = ${p.value}${p.unit ? ` ${p.unit}` : ''}${p.label ? ` – ${p.label}` : ''}` });
  return out;
}
