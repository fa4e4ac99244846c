import { EngineError } from '../../errors.js';
import { detectSteadyBlocks } from '../../engine/detect-steady-blocks.js';
import type { Segment } from '../../engine/segment.js';
import { segmentsFromLaps } from '../../engine/segments-from-laps.js';
import { segmentsFromRanges } from '../../engine/segments-from-ranges.js';
import type { NotebookTable } from '../cell-value.js';
import type { TransformConfig } from '../cell-config.js';
import { asTable, findColumn, type TransformInput } from './transform-input.js';

type SegmentConfig = Extract<TransformConfig, { op: 'segment' }>;

/**
 * Finds sections (laps, steady blocks or hand-set ranges) and adds a `segment` column
 * numbering them from 1 (NaN between sections), so formulas can group by it.
 */
export function segmentTransform(config: SegmentConfig, source: TransformInput): NotebookTable {
  const input = asTable(source, 'segment');
  const { table } = input;
  let segments: Segment[];
  if (config.method === 'manual') segments = segmentsFromRanges(config.ranges);
  else if (config.method === 'laps') {
    segments = source.value.kind === 'recording' ? segmentsFromLaps(source.value.recording) : (input.laps ?? []);
    if (segments.length === 0) throw new EngineError('no_laps', `"${source.name}" has no laps; use steady detection or set ranges by hand`);
  } else {
    const power = findColumn(table, [config.column, `ref_${config.column}`, 'ref_power', 'power']);
    if (power === undefined) throw new EngineError('no_column', `"${source.name}" has no column "${config.column}" to find steady blocks in`);
    segments = detectSteadyBlocks(table.timeS, power, { tolerancePct: config.tolerancePct, minDurationS: config.minDurationS });
  }
  const column = new Float64Array(table.timeS.length).fill(NaN);
  segments.forEach((s, k) => {
    for (let i = 0; i < column.length; i++) if (table.timeS[i]! >= s.startS && table.timeS[i]! < s.endS) column[i] = k + 1;
  });
  return { ...input, table: { ...table, columns: { ...table.columns, segment: column } }, segments, facts: { ...input.facts, segments: segments.length } };
}
