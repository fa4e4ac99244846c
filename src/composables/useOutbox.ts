import { useQuery } from '@tanstack/vue-query';
import { computed, toValue, type MaybeRefOrGetter } from 'vue';
import { getOutboxMessage, listOutbox } from '@/api/outbox';

/** Mail the server kept instead of sending (local installs without SMTP). */
export function useOutboxList() {
  return useQuery({
    queryKey: ['outbox', 'list'],
    queryFn: async () => (await listOutbox()).messages,
    refetchInterval: 10_000,
  });
}

export function useOutboxMessage(id: MaybeRefOrGetter<string | null>) {
  const current = computed(() => toValue(id));
  return useQuery({
    queryKey: computed(() => ['outbox', 'message', current.value] as const),
    queryFn: () => getOutboxMessage(current.value as string),
    enabled: computed(() => current.value !== null),
  });
}
