import type {
  AcceptInvitationResponse,
  CreateInvitationBody,
  InvitationListResponse,
  InvitationPreview,
  PendingInvitation,
} from '../../shared/api/invitations.js';
import { request } from './http';

const invitationsOf = (workspaceId: string) => `/api/workspaces/${encodeURIComponent(workspaceId)}/invitations`;

/** Mails an invitation link to an address (admins). */
export function createInvitation(workspaceId: string, body: CreateInvitationBody): Promise<PendingInvitation> {
  return request(invitationsOf(workspaceId), { method: 'POST', body });
}

/** Invitations not yet accepted, newest first (admins). */
export function listInvitations(workspaceId: string): Promise<InvitationListResponse> {
  return request(invitationsOf(workspaceId));
}

export function revokeInvitation(workspaceId: string, invitationId: string): Promise<void> {
  return request(`${invitationsOf(workspaceId)}/${encodeURIComponent(invitationId)}`, { method: 'DELETE' });
}

/** What an invitation link offers; works signed out. */
export function getInvitation(token: string, signal?: AbortSignal): Promise<InvitationPreview> {
  return request(`/api/invitations/${encodeURIComponent(token)}`, { signal });
}

/** Joins the signed-in account to the invitation's workspace. */
export function acceptInvitation(token: string): Promise<AcceptInvitationResponse> {
  return request(`/api/invitations/${encodeURIComponent(token)}/accept`, { method: 'POST' });
}
