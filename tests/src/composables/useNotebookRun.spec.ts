import { createPinia, setActivePinia } from 'pinia';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { effectScope, ref, shallowRef } from 'vue';
import type { EngineClient } from '@/composables/useEngine';
import { useNotebookRun } from '@/composables/useNotebookRun';
import { useNotebookStore } from '@/stores/notebook';
import { emptyNotebook } from '../../../shared/notebook/index.js';

function fakeEngine() {
  const run = vi.fn(async () => ({ ok: true as const, outputs: {}, computed: [], order: [], durationMs: 1 }));
  return { run, engine: { run, runningCellId: ref(null), outputs: shallowRef({}) } as unknown as EngineClient };
}

describe('useNotebookRun', () => {
  /** A runner over a fake engine, for a notebook of the given title. */
  function startRunner(title: string) {
    useNotebookStore().document = emptyNotebook(title);
    const { run, engine } = fakeEngine();
    return { run, runner: scope.run(() => useNotebookRun(engine))! };
  }

  let scope = effectScope();
  beforeEach(() => {
    scope = effectScope();
    setActivePinia(createPinia());
    vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout'] });
  });
  afterEach(() => {
    scope.stop();
    vi.useRealTimers();
  });

  it('sends a run asked for with no pause (the run key) in the same task, before any timer', async () => {
    const { run, runner } = startRunner('Now');
    runner.requestRun(0);
    expect(run).not.toHaveBeenCalled();
    await Promise.resolve();
    expect(run).toHaveBeenCalledTimes(1);
  });

  it('waits for the pause after an edit, and one run follows a burst of edits', async () => {
    const { run, runner } = startRunner('Typing');
    runner.requestRun();
    await vi.advanceTimersByTimeAsync(200);
    runner.requestRun();
    await vi.advanceTimersByTimeAsync(200);
    expect(run).not.toHaveBeenCalled();
    await vi.advanceTimersByTimeAsync(60);
    expect(run).toHaveBeenCalledTimes(1);
  });

  it('a run key press cancels the pending pause instead of running twice', async () => {
    const { run, runner } = startRunner('Both');
    runner.requestRun();
    runner.requestRun(0);
    await runner.whenIdle();
    await vi.advanceTimersByTimeAsync(1000);
    expect(run).toHaveBeenCalledTimes(1);
  });
});
