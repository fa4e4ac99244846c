import { generateDemoFiles, generateDemoRecordings, type DemoRecordings } from '../../../shared/demo/demo-files.js';
import type { DemoScenario } from '../../../shared/demo/scenarios.js';
import type { CellOutput, ShownValue } from '../../../shared/notebook/cell-output.js';
import { importRecording } from '../../../shared/recording/import-recording.js';
import type { Recording } from '../../../shared/recording/recording.js';

/** A scenario's files as stored (bytes), read back by the real importer, plus the truth they came from. */
export interface DemoInputs {
  inputs: Record<'reference' | 'test', Recording>;
  rides: DemoRecordings;
}

export async function loadDemoInputs(scenario: DemoScenario): Promise<DemoInputs> {
  const inputs = {} as Record<'reference' | 'test', Recording>;
  for (const file of generateDemoFiles(scenario)) {
    const r = await importRecording(file.bytes, file.fileName);
    if (!r.ok) throw new Error(`${file.fileName} did not import: ${r.error.message}`);
    inputs[file.slot] = r.recording;
  }
  return { inputs, rides: generateDemoRecordings(scenario) };
}

/** A number a formula cell assigned (`path` walks into records, e.g. ['fit', 'slope']). */
export function valueOf(output: CellOutput | undefined, ...path: string[]): number {
  if (output?.result?.type !== 'values') throw new Error(`cell ${output?.cellId} has no values`);
  let v: ShownValue | undefined = output.result.values[path[0]!];
  for (const key of path.slice(1)) v = (v as Record<string, ShownValue>)[key];
  if (typeof v !== 'number') throw new Error(`${path.join('.')} is not a number: ${JSON.stringify(v)}`);
  return v;
}

/** A list a formula cell assigned (short lists are shown whole). */
export function listOf(output: CellOutput | undefined, name: string): number[] {
  if (output?.result?.type !== 'values') throw new Error(`cell ${output?.cellId} has no values`);
  const v = output.result.values[name];
  if (v instanceof Float64Array) return Array.from(v);
  if (Array.isArray(v)) return v as number[];
  throw new Error(`${name} is not a short list: ${JSON.stringify(v)}`);
}

/** A fact a transform reported (e.g. the alignment's offsetS). */
export function factOf(output: CellOutput | undefined, name: string): number | string | undefined {
  if (output?.result?.type !== 'table') throw new Error(`cell ${output?.cellId} is not a table`);
  return output.result.table.facts?.[name];
}

/** Sections a segment transform found (startS/endS on the aligned grid). */
export function segmentsOf(output: CellOutput | undefined): { startS: number; endS: number }[] {
  if (output?.result?.type !== 'table' || !output.result.table.segments) throw new Error(`cell ${output?.cellId} has no segments`);
  return output.result.table.segments;
}

/** Index of the protocol block each found section lies inside (-1 when it spans two). */
export function blockOfSegment(blocks: readonly { startS: number; endS: number }[], s: { startS: number; endS: number }): number {
  return blocks.findIndex((b) => s.startS >= b.startS - 1 && s.endS <= b.endS + 1);
}

/** Cells that did not come out fresh, with why, so a failure message names them. */
export function notFresh(outputs: Record<string, CellOutput>): string[] {
  return Object.values(outputs)
    .filter((o) => o.state !== 'fresh')
    .map((o) => `${o.cellId}: ${o.state} ${o.error?.message ?? o.blockedBy?.name ?? ''}`);
}
