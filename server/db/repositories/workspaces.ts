import { and, asc, eq, sql } from 'drizzle-orm';
import type { WorkspaceRole } from '../../../shared/api/workspaces.js';
import type { Db } from '../client.js';
import { user, workspace, workspaceMember } from '../schema.js';

export interface WorkspaceRecord {
  id: string;
  name: string;
  personal: boolean;
  createdAt: Date;
}

export interface MembershipRecord extends WorkspaceRecord {
  role: WorkspaceRole;
}

export interface MemberRecord {
  userId: string;
  name: string;
  email: string;
  role: WorkspaceRole;
  addedAt: Date;
}

const wsColumns = { id: workspace.id, name: workspace.name, personal: workspace.personal, createdAt: workspace.createdAt };

/** Creates a workspace with its first member (an admin). */
export async function createWorkspace(
  db: Db,
  input: { name: string; personal: boolean; adminUserId: string },
): Promise<WorkspaceRecord> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(workspace)
      .values({ name: input.name, personal: input.personal, createdBy: input.adminUserId })
      .returning(wsColumns);
    await tx.insert(workspaceMember).values({ workspaceId: row!.id, userId: input.adminUserId, role: 'admin' });
    return row!;
  });
}

export async function findWorkspace(db: Db, id: string): Promise<WorkspaceRecord | undefined> {
  const rows = await db.select(wsColumns).from(workspace).where(eq(workspace.id, id));
  return rows[0];
}

/** The workspaces a user belongs to, personal first, then by name. */
export async function listMemberships(db: Db, userId: string): Promise<MembershipRecord[]> {
  return db
    .select({ ...wsColumns, role: workspaceMember.role })
    .from(workspaceMember)
    .innerJoin(workspace, eq(workspace.id, workspaceMember.workspaceId))
    .where(eq(workspaceMember.userId, userId))
    .orderBy(sql`${workspace.personal} desc`, asc(workspace.name), asc(workspace.createdAt));
}

export async function findRole(db: Db, workspaceId: string, userId: string): Promise<WorkspaceRole | undefined> {
  const rows = await db
    .select({ role: workspaceMember.role })
    .from(workspaceMember)
    .where(and(eq(workspaceMember.workspaceId, workspaceId), eq(workspaceMember.userId, userId)));
  return rows[0]?.role;
}

export async function listMembers(db: Db, workspaceId: string): Promise<MemberRecord[]> {
  return db
    .select({ userId: user.id, name: user.name, email: user.email, role: workspaceMember.role, addedAt: workspaceMember.createdAt })
    .from(workspaceMember)
    .innerJoin(user, eq(user.id, workspaceMember.userId))
    .where(eq(workspaceMember.workspaceId, workspaceId))
    .orderBy(asc(user.name), asc(user.email));
}

export async function findMember(db: Db, workspaceId: string, userId: string): Promise<MemberRecord | undefined> {
  const rows = await db
    .select({ userId: user.id, name: user.name, email: user.email, role: workspaceMember.role, addedAt: workspaceMember.createdAt })
    .from(workspaceMember)
    .innerJoin(user, eq(user.id, workspaceMember.userId))
    .where(and(eq(workspaceMember.workspaceId, workspaceId), eq(workspaceMember.userId, userId)));
  return rows[0];
}

/** Adds a member; returns false when the user already is one. */
export async function insertMember(db: Db, workspaceId: string, userId: string, role: WorkspaceRole): Promise<boolean> {
  const rows = await db
    .insert(workspaceMember)
    .values({ workspaceId, userId, role })
    .onConflictDoNothing()
    .returning({ userId: workspaceMember.userId });
  return rows.length > 0;
}

export async function updateMemberRole(db: Db, workspaceId: string, userId: string, role: WorkspaceRole): Promise<void> {
  await db
    .update(workspaceMember)
    .set({ role })
    .where(and(eq(workspaceMember.workspaceId, workspaceId), eq(workspaceMember.userId, userId)));
}

export async function deleteMember(db: Db, workspaceId: string, userId: string): Promise<void> {
  await db.delete(workspaceMember).where(and(eq(workspaceMember.workspaceId, workspaceId), eq(workspaceMember.userId, userId)));
}

export async function countAdmins(db: Db, workspaceId: string): Promise<number> {
  const rows = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(workspaceMember)
    .where(and(eq(workspaceMember.workspaceId, workspaceId), eq(workspaceMember.role, 'admin')));
  return rows[0]?.n ?? 0;
}
