import { keepPreviousData, useQuery } from '@tanstack/vue-query';
import { computed, ref, type Ref } from 'vue';
import { listUploads } from '@/api/uploads';

/** Cache keys of upload lists; a new upload invalidates `uploadKeys.all`. */
export const uploadKeys = {
  all: ['uploads'] as const,
  page: (workspaceId: string, page: number, size: number) => [...uploadKeys.all, 'list', workspaceId, page, size] as const,
};

/**
 * One workspace's earlier uploads, a page at a time, fetched only while `enabled` (the
 * chooser is open). The previous page stays on screen while the next one loads.
 */
export function useEarlierUploads(workspaceId: Ref<string | null | undefined>, enabled: Ref<boolean>, pageSize = 8) {
  const page = ref(1);
  const query = useQuery({
    queryKey: computed(() => uploadKeys.page(workspaceId.value ?? '', page.value, pageSize)),
    queryFn: ({ signal }) => listUploads(workspaceId.value!, { limit: pageSize, offset: (page.value - 1) * pageSize }, signal),
    enabled: computed(() => enabled.value && !!workspaceId.value),
    placeholderData: keepPreviousData,
    staleTime: 10_000,
  });
  return {
    page,
    pageSize,
    uploads: computed(() => query.data.value?.uploads ?? []),
    total: computed(() => query.data.value?.total ?? 0),
    isPending: computed(() => enabled.value && query.isFetching.value && !query.data.value),
    error: query.error,
  };
}
