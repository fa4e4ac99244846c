import type { CellOutput } from './cell-output.js';
import type { RunCache } from './run-notebook.js';

/**
 * Sending only what changed across the worker boundary. A run reports an output for every
 * cell, but most come from the cache unchanged, and a chart's output holds its data: cloning
 * them all on every edit, and drawing every chart again because its spec is a new object, is
 * what made an edit slow. The worker numbers each computed output (its serial); the page
 * says which serials it holds; a cell whose cached output the page already holds is only
 * named, and the page keeps its own object, so nothing that reads it sees a change.
 */

/** The outputs of one run, as few as the page needs. */
export interface OutputDelta {
  /** Outputs the page does not hold yet (computed now, failed, blocked, or not held). */
  outputs: Record<string, CellOutput>;
  /** Cells whose output the page already holds (the serial it gave): keep that object. */
  kept: string[];
  /** The serial of every fresh output of the run, sent or kept: what the page holds next. */
  serials: Record<string, number>;
}

/** Remembers the serial of each cached output it has numbered (worker side, one per worker). */
export function createOutputLedger() {
  const serialOf = new WeakMap<CellOutput, number>();
  let next = 1;
  return {
    /**
     * The part of `outputs` the page needs, given the serials it `held` after the last run.
     * `cache` is the run's cache: a fresh cell's entry holds its output as first computed.
     */
    delta(outputs: Record<string, CellOutput>, cache: RunCache, held: Record<string, number> = {}): OutputDelta {
      const delta: OutputDelta = { outputs: {}, kept: [], serials: {} };
      for (const [id, output] of Object.entries(outputs)) {
        const entry = output.state === 'fresh' ? cache.entries[id] : undefined;
        let serial: number | undefined;
        if (entry) {
          serial = serialOf.get(entry.output);
          if (serial === undefined) serialOf.set(entry.output, (serial = next++));
          delta.serials[id] = serial;
        }
        if (serial !== undefined && output.cached && held[id] === serial) delta.kept.push(id);
        else delta.outputs[id] = output;
      }
      return delta;
    },
  };
}

/**
 * The page's outputs after a run: sent ones as they came, kept ones as the page had them
 * (marked as reused, a new object only the first time), in run order. Throws when a kept
 * cell is missing from `previous`, which means the page and the worker disagree.
 */
export function mergeOutputs(previous: Readonly<Record<string, CellOutput>>, delta: Pick<OutputDelta, 'outputs' | 'kept'>, order: readonly string[]): Record<string, CellOutput> {
  const kept = new Set(delta.kept);
  const merged: Record<string, CellOutput> = {};
  for (const id of order) {
    const sent = delta.outputs[id];
    if (sent) {
      merged[id] = sent;
      continue;
    }
    if (!kept.has(id)) continue;
    const held = previous[id];
    if (!held) throw new Error(`the engine kept the output of cell ${id}, which this page does not hold`);
    merged[id] = held.cached && held.durationMs === 0 ? held : { ...held, cached: true, durationMs: 0 };
  }
  return merged;
}
