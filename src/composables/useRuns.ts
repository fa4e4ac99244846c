import { useMutation, useQuery, useQueryClient } from '@tanstack/vue-query';
import { computed, toValue, type MaybeRefOrGetter } from 'vue';
import type { CreateRunBody } from '../../shared/api/runs.js';
import { compareRuns, createRun, getRun, listRuns } from '@/api/runs';
import { notebookKeys } from '@/composables/useNotebooks';

/** Cache keys of a notebook's runs, under the notebook's key. */
export const runKeys = {
  list: (notebookId: string) => [...notebookKeys.one(notebookId), 'runs'] as const,
  compare: (notebookId: string, path: string) => [...notebookKeys.one(notebookId), 'runs', 'compare', path] as const,
  one: (runId: string) => ['runs', runId] as const,
};

/** The notebook's runs, newest first. */
export function useRunList(notebookId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    queryKey: computed(() => runKeys.list(toValue(notebookId))),
    queryFn: async () => (await listRuns(toValue(notebookId))).runs,
    enabled: computed(() => toValue(enabled)),
  });
}

/** One run with its snapshot (a stored run never changes). */
export function useRun(runId: MaybeRefOrGetter<string | null>) {
  return useQuery({
    queryKey: computed(() => runKeys.one(toValue(runId) ?? '')),
    queryFn: () => getRun(toValue(runId)!),
    enabled: computed(() => toValue(runId) !== null),
    staleTime: Infinity,
  });
}

/** Starts a server run; the answer is the stored run, which joins the list. */
export function useCreateRun(notebookId: MaybeRefOrGetter<string>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateRunBody) => createRun(toValue(notebookId), body),
    onSuccess: (run) => {
      queryClient.setQueryData(runKeys.one(run.id), run);
      // The list and every comparison gain a row.
      void queryClient.invalidateQueries({ queryKey: runKeys.list(run.notebookId) });
    },
  });
}

/** One output across every run, oldest first; idle while no path is chosen. */
export function useRunComparison(notebookId: MaybeRefOrGetter<string>, path: MaybeRefOrGetter<string | null>) {
  return useQuery({
    queryKey: computed(() => runKeys.compare(toValue(notebookId), toValue(path) ?? '')),
    queryFn: () => compareRuns(toValue(notebookId), toValue(path)!),
    enabled: computed(() => Boolean(toValue(path))),
  });
}
