import { useMutation, useQuery, useQueryClient } from '@tanstack/vue-query';
import type { NotebookResponse } from '../../shared/api/notebooks.js';
import { emptyNotebook } from '../../shared/notebook/document.js';
import { createNotebook, deleteNotebook, listNotebooks } from '@/api/notebooks';

/** Cache keys for notebook data, in one place so invalidation matches. */
export const notebookKeys = {
  all: ['notebooks'] as const,
  list: () => [...notebookKeys.all, 'list'] as const,
  one: (id: string) => [...notebookKeys.all, 'one', id] as const,
};

/** Every notebook the user can open, across workspaces. */
export function useNotebookList() {
  return useQuery({
    queryKey: notebookKeys.list(),
    queryFn: async () => (await listNotebooks()).notebooks,
  });
}

/** Creates an empty notebook in a workspace and answers the stored one. */
export function useCreateNotebook() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ workspaceId, title }: { workspaceId: string; title: string }) =>
      createNotebook({ workspaceId, document: emptyNotebook(title) }),
    onSuccess: (created: NotebookResponse) => {
      queryClient.setQueryData(notebookKeys.one(created.notebook.id), created);
      void queryClient.invalidateQueries({ queryKey: notebookKeys.list() });
    },
  });
}

export function useDeleteNotebook() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => deleteNotebook(id),
    onSuccess: (_void, id) => {
      queryClient.removeQueries({ queryKey: notebookKeys.one(id) });
      void queryClient.invalidateQueries({ queryKey: notebookKeys.list() });
    },
  });
}
