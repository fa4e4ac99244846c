import { useMutation, useQueryClient } from '@tanstack/vue-query';
import { exportHref, importNotebook } from '@/api/exports';
import { notebookKeys } from '@/composables/useNotebooks';

export { exportHref };

/** Opens a Cogbook notebook file as a new notebook in a workspace (all or nothing on the server). */
export function useImportNotebook() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ workspaceId, file }: { workspaceId: string; file: File }) => importNotebook(workspaceId, file),
    onSuccess: (created) => {
      queryClient.setQueryData(notebookKeys.one(created.notebook.id), created);
      void queryClient.invalidateQueries({ queryKey: notebookKeys.list() });
    },
  });
}
