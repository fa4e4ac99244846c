import { useMutation, useQuery, useQueryClient } from '@tanstack/vue-query';
import { computed, toValue, type MaybeRefOrGetter } from 'vue';
import type { CreateInvitationBody } from '../../shared/api/invitations.js';
import type { AddMemberBody, WorkspaceRole } from '../../shared/api/workspaces.js';
import { createInvitation, listInvitations, revokeInvitation } from '@/api/invitations';
import { addMember, changeMemberRole, listMembers, removeMember } from '@/api/workspaces';

const membersKey = (workspaceId: string | null) => ['workspaces', workspaceId, 'members'] as const;
const invitationsKey = (workspaceId: string | null) => ['workspaces', workspaceId, 'invitations'] as const;

/**
 * Members of a workspace and its pending invitations; waits while no workspace is
 * chosen. `manages` (admins only) turns the invitation list on: others get 403 for it.
 */
export function useWorkspaceMembers(workspaceId: MaybeRefOrGetter<string | null>, manages: MaybeRefOrGetter<boolean> = true) {
  const queryClient = useQueryClient();
  const id = computed(() => toValue(workspaceId));
  const invalidate = () => queryClient.invalidateQueries({ queryKey: membersKey(id.value) });
  const invalidateInvitations = () => queryClient.invalidateQueries({ queryKey: invitationsKey(id.value) });
  const requireId = (): string => {
    if (!id.value) throw new Error('No workspace is selected.');
    return id.value;
  };

  const members = useQuery({
    queryKey: computed(() => membersKey(id.value)),
    queryFn: async () => (await listMembers(requireId())).members,
    enabled: computed(() => id.value !== null),
  });

  const invitations = useQuery({
    queryKey: computed(() => invitationsKey(id.value)),
    queryFn: async () => (await listInvitations(requireId())).invitations,
    enabled: computed(() => id.value !== null && toValue(manages)),
  });

  const add = useMutation({
    mutationFn: (body: AddMemberBody) => addMember(requireId(), body),
    onSuccess: invalidate,
  });

  const invite = useMutation({
    mutationFn: (body: CreateInvitationBody) => createInvitation(requireId(), body),
    onSuccess: invalidateInvitations,
  });

  const revoke = useMutation({
    mutationFn: (invitationId: string) => revokeInvitation(requireId(), invitationId),
    onSuccess: invalidateInvitations,
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

  return { members, invitations, add, invite, revoke, changeRole, remove };
}
