import { inject, type InjectionKey } from 'vue';
import type { EngineClient } from '@/composables/useEngine';
import type { useNotebookInputs } from '@/composables/useNotebookInputs';

/** What the notebook page hands down to its cells: the engine worker and the input files. */
export interface NotebookContext {
  engine: EngineClient;
  inputs: ReturnType<typeof useNotebookInputs>;
}

export const NOTEBOOK_CONTEXT: InjectionKey<NotebookContext> = Symbol('notebook');

/** The page's notebook context; cells are only ever mounted under the notebook page. */
export function useNotebookContext(): NotebookContext {
  const ctx = inject(NOTEBOOK_CONTEXT);
  if (!ctx) throw new Error('Notebook cell mounted outside the notebook page: provide NOTEBOOK_CONTEXT (see NotebookView.vue).');
  return ctx;
}
