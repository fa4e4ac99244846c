import * as Comlink from 'comlink';
import { afterEach, describe, expect, it } from 'vitest';
import { createEngineClient, type EngineClient } from '@/composables/useEngine';
import type { EngineApi, EngineRunOptions, EngineRunResult } from '../../../shared/engine-api.js';
import { emptyNotebook, type NotebookDocument } from '../../../shared/notebook/index.js';
import type { Recording } from '../../../shared/recording/recording.js';

/** A stand-in worker: a comlink endpoint on a MessageChannel, serving `api`. */
function fakeWorker(api: Partial<EngineApi>, log: { terminated: number }): Worker {
  const { port1, port2 } = new MessageChannel();
  Comlink.expose(api, port2);
  port1.start();
  return Object.assign(port1, {
    terminate: () => {
      log.terminated++;
      port1.close();
      port2.close();
    },
  }) as unknown as Worker;
}

const doc: NotebookDocument = {
  ...emptyNotebook('Timing'),
  cells: [
    { id: 'c1', kind: 'formula', name: 'quick', config: { source: 'x = 1' } },
    { id: 'c2', kind: 'formula', name: 'slow', config: { source: 'y = 2' } },
  ],
};

let client: EngineClient | undefined;
afterEach(() => client?.dispose());

describe('createEngineClient', () => {
  it('stops a run over the time limit, names the running cell and starts a fresh worker with the slots bound again', async () => {
    const log = { terminated: 0 };
    const bindings: string[][] = [];
    let workers = 0;
    client = createEngineClient({
      runTimeLimitMs: 100,
      createWorker: () => {
        workers++;
        return fakeWorker(
          {
            bindSlots: async (r: Record<string, Recording | null>) => void bindings.push(Object.keys(r)),
            // Reports that cell c2 started, then never finishes.
            runNotebook: async (_d: NotebookDocument, _o?: EngineRunOptions, onCellStart?: (id: string) => void) => {
              await onCellStart?.('c2');
              return new Promise<never>(() => undefined);
            },
          },
          log,
        );
      },
    });
    await client.bindSlots({ reference: { meta: {}, time: new Float64Array(1), columns: {}, events: [], warnings: [] } as unknown as Recording });
    const outcome = await client.run(doc);
    expect(outcome.ok).toBe(false);
    expect(!outcome.ok && outcome.error).toMatchObject({ code: 'run_timeout', where: { cell: 'c2' } });
    expect(!outcome.ok && outcome.error.message).toContain('cell "slow"');
    expect(client.outputs.value['c2']).toMatchObject({ state: 'failed', error: { code: 'run_timeout' } });
    expect(log.terminated).toBe(1);
    expect(workers).toBe(2);
    expect(bindings).toEqual([['reference'], ['reference']]);
    expect(client.phase.value).toBe('idle');
  });

  it('skips the stopped cell in later runs until it changes, so the other cells compute', async () => {
    const log = { terminated: 0 };
    const seen: (EngineRunOptions | undefined)[] = [];
    let first = true;
    client = createEngineClient({
      runTimeLimitMs: 100,
      createWorker: () =>
        fakeWorker(
          {
            bindSlots: async () => undefined,
            runNotebook: async (_d: NotebookDocument, o?: EngineRunOptions, onCellStart?: (id: string) => void) => {
              seen.push(o);
              if (first) {
                first = false;
                await onCellStart?.('c2');
                return new Promise<never>(() => undefined);
              }
              return { outputs: {}, order: ['c1', 'c2'], computed: ['c1'], durationMs: 1 };
            },
          },
          log,
        ),
    });
    expect((await client.run(doc)).ok).toBe(false);
    expect(client.outputs.value['c2']!.error?.message).toMatch(/stopped after 0 s while computing cell "slow"; the engine was restarted, and this cell waits until you change it/);
    // Another cell edited: the runaway cell is passed as stopped, not computed.
    const edited: NotebookDocument = { ...doc, cells: [{ ...doc.cells[0]!, config: { source: 'x = 2' } } as NotebookDocument['cells'][number], doc.cells[1]!] };
    expect((await client.run(edited)).ok).toBe(true);
    expect(seen[1]?.stopped?.['c2']).toMatchObject({ code: 'run_timeout', where: { cell: 'c2' } });
    expect(Object.keys(seen[1]?.stopped ?? {})).toEqual(['c2']);
    // The runaway cell itself changed: it is computed again.
    const fixed: NotebookDocument = { ...edited, cells: [edited.cells[0]!, { ...doc.cells[1]!, config: { source: 'y = 3' } } as NotebookDocument['cells'][number]] };
    expect((await client.run(fixed)).ok).toBe(true);
    expect(seen[2]?.stopped).toBeUndefined();
    expect(log.terminated).toBe(1);
  });

  it('keeps the outputs of a run that finishes', async () => {
    const log = { terminated: 0 };
    client = createEngineClient({
      createWorker: () =>
        fakeWorker(
          {
            runNotebook: async () => ({
              outputs: { c1: { cellId: 'c1', name: 'quick', kind: 'formula', state: 'fresh', durationMs: 1, cached: false, warnings: [] } },
              order: ['c1'],
              computed: ['c1'],
              durationMs: 3,
            }),
          },
          log,
        ),
    });
    const outcome = await client.run(doc);
    expect(outcome.ok).toBe(true);
    expect(client.outputs.value['c1']!.state).toBe('fresh');
    expect(client.lastRun.value).toEqual({ durationMs: 3, computed: ['c1'] });
    expect(log.terminated).toBe(0);
  });

  it('keeps its own output objects for the cells the worker says are unchanged, and says which it holds', async () => {
    const log = { terminated: 0 };
    const seen: (EngineRunOptions | undefined)[] = [];
    const out = (id: string, durationMs: number, cached: boolean) => ({ cellId: id, name: id, kind: 'formula' as const, state: 'fresh' as const, durationMs, cached, warnings: [], result: { type: 'values' as const, values: { v: durationMs } } });
    let run = 0;
    client = createEngineClient({
      createWorker: () =>
        fakeWorker(
          {
            runNotebook: async (_d: NotebookDocument, o?: EngineRunOptions) => {
              seen.push(o);
              run++;
              const result: EngineRunResult =
                run === 1
                  ? { outputs: { c1: out('c1', 5, false), c2: out('c2', 7, false) }, kept: [], serials: { c1: 1, c2: 2 }, order: ['c1', 'c2'], computed: ['c1', 'c2'], durationMs: 12 }
                  : { outputs: { c2: out('c2', 9, false) }, kept: ['c1'], serials: { c1: 1, c2: 3 }, order: ['c1', 'c2'], computed: ['c2'], durationMs: 9 };
              return result;
            },
          },
          log,
        ),
    });
    await client.run(doc);
    const firstResult = client.outputs.value['c1']!.result;
    const outcome = await client.run(doc);
    expect(seen[0]?.held).toEqual({});
    expect(seen[1]?.held).toEqual({ c1: 1, c2: 2 });
    expect(outcome.ok && Object.keys(outcome.outputs)).toEqual(['c1', 'c2']);
    expect(client.outputs.value['c1']!.result).toBe(firstResult);
    expect(client.outputs.value['c1']).toMatchObject({ cached: true, durationMs: 0 });
    expect(client.outputs.value['c2']!.result).toEqual({ type: 'values', values: { v: 9 } });
  });
});
