import { useMutation, useQuery, useQueryClient } from '@tanstack/vue-query';
import { computed, toValue, type MaybeRefOrGetter } from 'vue';
import type { NotebookResponse } from '../../shared/api/notebooks.js';
import { getRevision, listRevisions, restoreRevision } from '@/api/notebooks';
import { notebookKeys } from '@/composables/useNotebooks';

/** Cache keys of a notebook's history, under the notebook's own key so one invalidation covers both. */
export const historyKeys = {
  list: (id: string) => [...notebookKeys.one(id), 'revisions'] as const,
  one: (id: string, revision: number) => [...notebookKeys.one(id), 'revisions', revision] as const,
};

/** Every saved revision of a notebook, newest first; fetched only while `enabled` (the drawer is open). */
export function useRevisionList(notebookId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    queryKey: computed(() => historyKeys.list(toValue(notebookId))),
    queryFn: async () => (await listRevisions(toValue(notebookId))).revisions,
    enabled: computed(() => toValue(enabled)),
    staleTime: 0,
  });
}

/** One revision with its document, for reading it without opening it in the editor. */
export function useRevision(notebookId: MaybeRefOrGetter<string>, revision: MaybeRefOrGetter<number | null>) {
  return useQuery({
    queryKey: computed(() => historyKeys.one(toValue(notebookId), toValue(revision) ?? 0)),
    queryFn: () => getRevision(toValue(notebookId), toValue(revision)!),
    enabled: computed(() => toValue(revision) !== null),
    // A stored revision never changes.
    staleTime: Infinity,
  });
}

/**
 * Copies an old revision into a new one. History is never rewritten, so the answer is
 * the notebook at a new revision number; `onRestored` lets the editor take it over.
 */
export function useRestoreRevision(notebookId: MaybeRefOrGetter<string>, onRestored?: (response: NotebookResponse) => void) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (revision: number) => restoreRevision(toValue(notebookId), revision, `Restored revision ${revision}`),
    onSuccess: (response) => {
      queryClient.setQueryData(notebookKeys.one(response.notebook.id), response);
      void queryClient.invalidateQueries({ queryKey: historyKeys.list(response.notebook.id) });
      void queryClient.invalidateQueries({ queryKey: notebookKeys.list() });
      onRestored?.(response);
    },
  });
}
