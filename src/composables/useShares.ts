import { useMutation, useQuery, useQueryClient } from '@tanstack/vue-query';
import { computed, toValue, type MaybeRefOrGetter } from 'vue';
import type { ForkBody } from '../../shared/api/forks.js';
import type { NotebookResponse } from '../../shared/api/notebooks.js';
import { createShare, forkNotebook, forkShared, getSharedNotebook, listShares, revokeShare } from '@/api/shares';
import { notebookKeys } from '@/composables/useNotebooks';

export const shareKeys = {
  list: (notebookId: string) => [...notebookKeys.one(notebookId), 'shares'] as const,
  opened: (token: string) => ['shared', token] as const,
};

/** The notebook's live read-only links, newest first. */
export function useShareList(notebookId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    queryKey: computed(() => shareKeys.list(toValue(notebookId))),
    queryFn: async () => (await listShares(toValue(notebookId))).shares,
    enabled: computed(() => toValue(enabled)),
    staleTime: 0,
  });
}

export function useCreateShare(notebookId: MaybeRefOrGetter<string>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (membersOnly: boolean) => createShare(toValue(notebookId), { membersOnly }),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: shareKeys.list(toValue(notebookId)) }),
  });
}

export function useRevokeShare(notebookId: MaybeRefOrGetter<string>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (token: string) => revokeShare(token),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: shareKeys.list(toValue(notebookId)) }),
  });
}

/** What a share link opens (public unless the link is for members only). */
export function useSharedNotebook(token: MaybeRefOrGetter<string>) {
  return useQuery({
    queryKey: computed(() => shareKeys.opened(toValue(token))),
    queryFn: ({ signal }) => getSharedNotebook(toValue(token), signal),
  });
}

/**
 * Copies a notebook into one of the caller's workspaces, either directly (they can read
 * it) or through a share link's token.
 */
export function useFork() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (args: { notebookId?: string; token?: string; body: ForkBody }): Promise<NotebookResponse> =>
      args.token ? forkShared(args.token, args.body) : forkNotebook(args.notebookId!, args.body),
    onSuccess: (created) => {
      queryClient.setQueryData(notebookKeys.one(created.notebook.id), created);
      void queryClient.invalidateQueries({ queryKey: notebookKeys.list() });
    },
  });
}
