import { useMutation, useQuery, useQueryClient } from '@tanstack/vue-query';
import { computed, toValue, type MaybeRefOrGetter } from 'vue';
import type { Publication } from '../../shared/api/publications.js';
import { getPublication, getPublished, publish, unpublish } from '@/api/publications';
import { notebookKeys } from '@/composables/useNotebooks';

export const publicationKeys = {
  of: (notebookId: string) => [...notebookKeys.one(notebookId), 'publication'] as const,
  page: (slug: string) => ['published', slug] as const,
};

/** The notebook's publication, or null while it is not published. */
export function usePublication(notebookId: MaybeRefOrGetter<string>, enabled: MaybeRefOrGetter<boolean> = true) {
  return useQuery({
    queryKey: computed(() => publicationKeys.of(toValue(notebookId))),
    queryFn: (): Promise<Publication | null> => getPublication(toValue(notebookId)),
    enabled: computed(() => toValue(enabled)),
    staleTime: 0,
  });
}

/** Publishes or republishes (same address, new snapshot of the current revision). */
export function usePublish(notebookId: MaybeRefOrGetter<string>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (allowDownloads: boolean) => publish(toValue(notebookId), { allowDownloads }),
    onSuccess: (publication) => {
      queryClient.setQueryData(publicationKeys.of(toValue(notebookId)), publication);
      queryClient.removeQueries({ queryKey: publicationKeys.page(publication.slug) });
    },
  });
}

export function useUnpublish(notebookId: MaybeRefOrGetter<string>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => unpublish(toValue(notebookId)),
    onSuccess: () => queryClient.setQueryData(publicationKeys.of(toValue(notebookId)), null),
  });
}

/** A published page's content for readers. */
export function usePublishedPage(slug: MaybeRefOrGetter<string>) {
  return useQuery({
    queryKey: computed(() => publicationKeys.page(toValue(slug))),
    queryFn: ({ signal }) => getPublished(toValue(slug), signal),
  });
}
