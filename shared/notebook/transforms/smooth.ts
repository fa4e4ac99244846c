import { rollingMean } from '../../engine/rolling-mean.js';
import type { NotebookTable } from '../cell-value.js';
import type { TransformConfig } from '../cell-config.js';
import { asTable, type TransformInput } from './transform-input.js';

type SmoothConfig = Extract<TransformConfig, { op: 'smooth' }>;

/** Columns that hold a state or a label: averaging them would invent gears and blocks. */
const STATE_COLUMN = /gear|teeth|segment/i;

/** Moving average of every measured column over `windowS` seconds of the table's grid. */
export function smoothTransform(config: SmoothConfig, source: TransformInput): NotebookTable {
  const input = asTable(source, 'smooth');
  const { table } = input;
  const dt = table.meta?.intervalS ?? (table.timeS.length > 1 ? table.timeS[1]! - table.timeS[0]! : 1);
  const window = Math.max(1, Math.round(config.windowS / dt));
  const columns: Record<string, Float64Array> = {};
  for (const [k, v] of Object.entries(table.columns)) {
    columns[k] = STATE_COLUMN.test(k) ? v : rollingMean(v, window, { align: config.centred ? 'centred' : 'trailing' });
  }
  return { ...input, table: { ...table, columns }, facts: { ...input.facts, windowSamples: window } };
}
