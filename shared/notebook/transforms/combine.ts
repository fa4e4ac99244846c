import { estimateOffset } from '../../engine/estimate-offset.js';
import { pairRecordings } from '../../engine/pair-recordings.js';
import type { NotebookTable } from '../cell-value.js';
import type { TransformConfig } from '../cell-config.js';
import { asRecording, type TransformInput } from './transform-input.js';

type CombineConfig = Extract<TransformConfig, { op: 'combine' }>;

/**
 * Aligns every other recording to the first (the reference) and joins them on the
 * reference's grid: `ref_*` columns once, then each device's `test_*` columns renamed
 * `<name>_*` (e.g. `dut_b_power`). Rows cover the first pair's overlap; a device
 * missing there reads NaN.
 */
export function combineTransform(config: CombineConfig, inputs: TransformInput[]): NotebookTable {
  const [first, ...rest] = inputs;
  const reference = asRecording(first!, 'combine');
  const facts: Record<string, number> = {};
  let base: NotebookTable | undefined;
  for (const input of rest) {
    const test = asRecording(input, 'combine');
    const { offsetSeconds } = estimateOffset(reference, test, { intervalS: config.intervalS });
    const pair = pairRecordings(reference, test, { offsetSeconds, intervalS: config.intervalS });
    facts[`${input.name}_offsetS`] = offsetSeconds;
    if (base === undefined) {
      const columns: Record<string, Float64Array> = {};
      for (const [k, v] of Object.entries(pair.columns)) if (v && !k.startsWith('test_')) columns[k] = v;
      base = { table: { timeS: pair.timeS, columns, meta: { intervalS: config.intervalS } } };
    }
    const t0 = base.table.timeS[0] ?? 0;
    for (const [k, v] of Object.entries(pair.columns)) {
      if (!v || !k.startsWith('test_')) continue;
      const out = new Float64Array(base.table.timeS.length).fill(NaN);
      for (let i = 0; i < pair.timeS.length; i++) {
        const j = Math.round((pair.timeS[i]! - t0) / config.intervalS);
        if (j >= 0 && j < out.length) out[j] = v[i]!;
      }
      base.table.columns[`${input.name}_${k.slice(5)}`] = out;
    }
  }
  return { ...base!, facts };
}
