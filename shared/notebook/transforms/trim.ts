import type { NotebookTable } from '../cell-value.js';
import type { TransformConfig } from '../cell-config.js';
import { asTable, sliceTable, type TransformInput } from './transform-input.js';

type TrimConfig = Extract<TransformConfig, { op: 'trim' }>;

/** Keeps the rows with startS <= time <= endS (endS null = to the end); sections are clipped too. */
export function trimTransform(config: TrimConfig, source: TransformInput): NotebookTable {
  const input = asTable(source, 'trim');
  const t = input.table.timeS;
  const end = config.endS ?? Infinity;
  let from = 0;
  while (from < t.length && t[from]! < config.startS) from++;
  let to = from;
  while (to < t.length && t[to]! <= end) to++;
  const clip = <S extends { startS: number; endS: number }>(list?: S[]) =>
    list
      ?.filter((s) => s.endS > config.startS && s.startS < end)
      .map((s) => ({ ...s, startS: Math.max(s.startS, config.startS), endS: Math.min(s.endS, end) }));
  const out: NotebookTable = { ...input, table: sliceTable(input.table, from, to) };
  const segments = clip(input.segments);
  const laps = clip(input.laps);
  if (segments) out.segments = segments;
  if (laps) out.laps = laps;
  return out;
}
