import type { Recording } from '../recording/recording.js';
import type { NotebookGraph } from './build-graph.js';
import type { NotebookDocument } from './document.js';
import { hashRecording, hashText } from './hash.js';

/**
 * The cache key of every cell, by id: a hash of its kind, name and config, the values
 * of the parameters it reads, the keys of the cells it reads (so a change flows down)
 * and, for import cells, the content of the bound recording. Chart keys include the
 * slot labels, which set device colours. A cell whose key is unchanged since the last
 * run can reuse its result.
 */
export function cellKeys(graph: NotebookGraph, document: NotebookDocument, inputs: Record<string, Recording>): Map<string, string> {
  const params = new Map(document.parameters.map((p) => [p.name, p.value]));
  const keys = new Map<string, string>();
  for (const id of graph.order) {
    const g = graph.cells[id]!;
    const { cell } = g;
    let recordingKey: string | null = null;
    if (cell.kind === 'import') {
      const r = inputs[cell.config.slot];
      // hashRecording keeps each recording's key, so a recording read by several cells is hashed once.
      if (r !== undefined) recordingKey = hashRecording(r);
    }
    keys.set(
      id,
      hashText(
        JSON.stringify([
          cell.kind,
          cell.name,
          cell.config,
          g.parameters.map((p) => [p, params.get(p)]),
          g.dependsOn.map((d) => keys.get(d) ?? null),
          recordingKey,
          cell.kind === 'chart' ? document.slots.map((s) => [s.name, s.label]) : null,
        ]),
      ),
    );
  }
  return keys;
}
