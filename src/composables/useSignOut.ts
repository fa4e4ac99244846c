import { useQueryClient } from '@tanstack/vue-query';
import { useSessionStore } from '@/stores/session';

/** Signs out and forgets every cached answer, so the next user sees none of it. */
export function useSignOut(): () => Promise<void> {
  const session = useSessionStore();
  const queryClient = useQueryClient();
  return async () => {
    try {
      await session.signOut();
    } finally {
      queryClient.clear();
    }
  };
}
