import type {
  AddMemberBody,
  MemberListResponse,
  WorkspaceListResponse,
  WorkspaceMember,
  WorkspaceRole,
} from '../../shared/api/workspaces.js';
import { request } from './http';

const base = (workspaceId: string) => `/api/workspaces/${encodeURIComponent(workspaceId)}`;

export function listWorkspaces(): Promise<WorkspaceListResponse> {
  return request('/api/workspaces');
}

export function listMembers(workspaceId: string): Promise<MemberListResponse> {
  return request(`${base(workspaceId)}/members`);
}

export function addMember(workspaceId: string, body: AddMemberBody): Promise<WorkspaceMember> {
  return request(`${base(workspaceId)}/members`, { method: 'POST', body });
}

export function changeMemberRole(workspaceId: string, userId: string, role: WorkspaceRole): Promise<WorkspaceMember> {
  return request(`${base(workspaceId)}/members/${encodeURIComponent(userId)}`, { method: 'PATCH', body: { role } });
}

export function removeMember(workspaceId: string, userId: string): Promise<void> {
  return request(`${base(workspaceId)}/members/${encodeURIComponent(userId)}`, { method: 'DELETE' });
}
