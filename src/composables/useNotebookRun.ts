import { onScopeDispose, ref, toRaw, watch } from 'vue';
import type { CellOutput } from '../../shared/notebook/cell-output.js';
import type { EngineClient } from '@/composables/useEngine';
import { useNotebookStore } from '@/stores/notebook';

/** Wait this long after an edit before running, so typing does not start a run per key. */
const RUN_DELAY_MS = 250;
/** Runs shorter than this finish before any progress indicator appears. */
const PROGRESS_AFTER_MS = 400;

/**
 * Keeps the notebook's outputs in step with its document: every edit (and every newly
 * bound recording) schedules a run in the engine worker, which recomputes only the cells
 * whose inputs changed. One run at a time; edits during a run queue exactly one more.
 */
export function useNotebookRun(engine: EngineClient) {
  const store = useNotebookStore();
  /** True once a run has taken longer than a moment (drives the progress bar). */
  const slow = ref(false);
  let timer: ReturnType<typeof setTimeout> | undefined;
  let slowTimer: ReturnType<typeof setTimeout> | undefined;
  let active: Promise<void> | null = null;
  let again = false;
  let disposed = false;

  async function runOnce(): Promise<void> {
    const doc = store.document;
    if (!doc) return;
    store.runStarted();
    slowTimer = setTimeout(() => (slow.value = true), PROGRESS_AFTER_MS);
    try {
      // The document is plain data already; toRaw guards against a reactive wrapper slipping in.
      const outcome = await engine.run(toRaw(doc));
      if (disposed) return;
      if (outcome.ok) store.runFinished(outcome);
      else store.runStopped(outcome.error.message, engine.outputs.value as Record<string, CellOutput>);
    } finally {
      clearTimeout(slowTimer);
      slow.value = false;
    }
  }

  async function loop(): Promise<void> {
    do {
      again = false;
      await runOnce();
    } while (again && !disposed);
    active = null;
  }

  function start(): void {
    if (active) again = true;
    else active = loop();
  }

  /**
   * Runs soon (after a short pause), or right after the run under way. With no pause (the
   * run key) the request goes to the worker in the same task as the key press, not after
   * the next frame.
   */
  function requestRun(delayMs = RUN_DELAY_MS): void {
    clearTimeout(timer);
    if (delayMs <= 0) queueMicrotask(start);
    else timer = setTimeout(start, delayMs);
  }

  watch(() => store.document, (doc, before) => {
    if (doc && before && doc !== before) requestRun();
  });
  // Progress reports cross the worker boundary on their own and may land after the run
  // has ended; a late one must not leave a cell showing "computing".
  watch(engine.runningCellId, (id) => {
    store.runningCellId = store.running ? id : null;
  });

  onScopeDispose(() => {
    disposed = true;
    clearTimeout(timer);
    clearTimeout(slowTimer);
  });

  return { requestRun, slow, whenIdle: () => active ?? Promise.resolve() };
}
