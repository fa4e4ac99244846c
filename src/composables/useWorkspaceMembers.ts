import { useMutation, useQuery, useQueryClient } from '@tanstack/vue-query';
import { computed, toValue, type MaybeRefOrGetter } from 'vue';
import type { AddMemberBody, WorkspaceRole } from '../../shared/api/workspaces.js';
import { addMember, changeMemberRole, listMembers, removeMember } from '@/api/workspaces';

const membersKey = (workspaceId: string | null) => ['workspaces', workspaceId, 'members'] as const;

/** Members of a workspace; waits while no workspace is chosen. */
export function useWorkspaceMembers(workspaceId: MaybeRefOrGetter<string | null>) {
  const queryClient = useQueryClient();
  const id = computed(() => toValue(workspaceId));
  const invalidate = () => queryClient.invalidateQueries({ queryKey: membersKey(id.value) });
  const requireId = (): string => {
    if (!id.value) throw new Error('No workspace is selected.');
    return id.value;
  };

  const members = useQuery({
    queryKey: computed(() => membersKey(id.value)),
    queryFn: async () => (await listMembers(requireId())).members,
    enabled: computed(() => id.value !== null),
  });

  const add = useMutation({
    mutationFn: (body: AddMemberBody) => addMember(requireId(), body),
    onSuccess: invalidate,
  });

  const changeRole = useMutation({
    mutationFn: ({ userId, role }: { userId: string; role: WorkspaceRole }) =>
      changeMemberRole(requireId(), userId, role),
    onSuccess: invalidate,
  });

  const remove = useMutation({
    mutationFn: (userId: string) => removeMember(requireId(), userId),
    onSuccess: invalidate,
  });

  return { members, add, changeRole, remove };
}
