import type { AddMemberBody, WorkspaceMember, WorkspaceRole, WorkspaceSummary } from '../../shared/api/workspaces.js';
import type { Db } from '../db/client.js';
import { findUserByEmail } from '../db/repositories/users.js';
import * as repo from '../db/repositories/workspaces.js';
import { AppError, notFound } from '../errors.js';
import { assertWorkspace } from './policy.js';

/**
 * Every new account gets a personal workspace where it is the admin, so a person who
 * signs up alone can create notebooks at once; labs add them to shared workspaces.
 */
export async function createPersonalWorkspace(db: Db, user: { id: string; name: string }): Promise<void> {
  await repo.createWorkspace(db, { name: `${user.name}'s notebooks`, personal: true, adminUserId: user.id });
}

/** A shared (non-personal) workspace with its first admin; used by the demo seed and admin tools. */
export async function createSharedWorkspace(db: Db, name: string, adminUserId: string): Promise<{ id: string }> {
  return repo.createWorkspace(db, { name, personal: false, adminUserId });
}

export async function listWorkspaces(db: Db, userId: string): Promise<WorkspaceSummary[]> {
  const rows = await repo.listMemberships(db, userId);
  return rows.map((w) => ({ id: w.id, name: w.name, role: w.role, personal: w.personal, createdAt: w.createdAt.toISOString() }));
}

export async function listMembers(db: Db, userId: string, workspaceId: string): Promise<WorkspaceMember[]> {
  assertWorkspace(await repo.findRole(db, workspaceId, userId), 'read');
  return (await repo.listMembers(db, workspaceId)).map(toMember);
}

export async function addMember(db: Db, userId: string, workspaceId: string, body: AddMemberBody): Promise<WorkspaceMember> {
  assertWorkspace(await repo.findRole(db, workspaceId, userId), 'manage-members');
  const target = await findUserByEmail(db, body.email);
  if (!target) {
    throw new AppError(404, 'user_not_found', `No account uses ${body.email}. Ask them to sign up first, then add them.`);
  }
  const added = await repo.insertMember(db, workspaceId, target.id, body.role);
  if (!added) throw new AppError(409, 'already_member', `${body.email} is already a member of this workspace.`);
  return toMember((await repo.findMember(db, workspaceId, target.id))!);
}

export async function updateMember(db: Db, userId: string, workspaceId: string, memberId: string, role: WorkspaceRole): Promise<WorkspaceMember> {
  assertWorkspace(await repo.findRole(db, workspaceId, userId), 'manage-members');
  const member = await repo.findMember(db, workspaceId, memberId);
  if (!member) throw notFound('Member');
  if (member.role === 'admin' && role !== 'admin') await assertNotLastAdmin(db, workspaceId);
  await repo.updateMemberRole(db, workspaceId, memberId, role);
  return toMember({ ...member, role });
}

/** Removes a member; their access ends with the next request (roles are read per request). */
export async function removeMember(db: Db, userId: string, workspaceId: string, memberId: string): Promise<void> {
  assertWorkspace(await repo.findRole(db, workspaceId, userId), 'manage-members');
  const member = await repo.findMember(db, workspaceId, memberId);
  if (!member) throw notFound('Member');
  if (member.role === 'admin') await assertNotLastAdmin(db, workspaceId);
  await repo.deleteMember(db, workspaceId, memberId);
}

export async function workspaceRoleOf(db: Db, workspaceId: string, userId: string): Promise<WorkspaceRole | undefined> {
  return repo.findRole(db, workspaceId, userId);
}

async function assertNotLastAdmin(db: Db, workspaceId: string): Promise<void> {
  if ((await repo.countAdmins(db, workspaceId)) <= 1) {
    throw new AppError(409, 'last_admin', 'A workspace needs at least one admin: make someone else admin first.');
  }
}

function toMember(m: repo.MemberRecord): WorkspaceMember {
  return { user: { id: m.userId, name: m.name, email: m.email }, role: m.role, addedAt: m.addedAt.toISOString() };
}
