import { and, desc, eq, gt, isNull } from 'drizzle-orm';
import type { WorkspaceRole } from '../../../shared/api/workspaces.js';
import type { Db } from '../client.js';
import { user, workspace, workspaceInvitation, workspaceMember } from '../schema.js';

export interface InvitationRecord {
  id: string;
  workspaceId: string;
  workspaceName: string;
  email: string;
  role: WorkspaceRole;
  invitedBy: string | null;
  inviterName: string | null;
  createdAt: Date;
  expiresAt: Date;
}

const columns = {
  id: workspaceInvitation.id,
  workspaceId: workspaceInvitation.workspaceId,
  workspaceName: workspace.name,
  email: workspaceInvitation.email,
  role: workspaceInvitation.role,
  invitedBy: workspaceInvitation.invitedBy,
  inviterName: user.name,
  createdAt: workspaceInvitation.createdAt,
  expiresAt: workspaceInvitation.expiresAt,
};

/** Not accepted and not expired at `now`. */
const open = (now: Date) => and(isNull(workspaceInvitation.acceptedAt), gt(workspaceInvitation.expiresAt, now));

/**
 * Stores an invitation, replacing any open one for the same address in the workspace,
 * so only the newest link works.
 */
export async function replaceInvitation(
  db: Db,
  input: { workspaceId: string; email: string; role: WorkspaceRole; tokenHash: string; invitedBy: string; expiresAt: Date },
): Promise<string> {
  return db.transaction(async (tx) => {
    await tx
      .delete(workspaceInvitation)
      .where(
        and(
          eq(workspaceInvitation.workspaceId, input.workspaceId),
          eq(workspaceInvitation.email, input.email),
          isNull(workspaceInvitation.acceptedAt),
        ),
      );
    const [row] = await tx.insert(workspaceInvitation).values(input).returning({ id: workspaceInvitation.id });
    return row!.id;
  });
}

/** An open invitation by its token's hash (accepted, expired and revoked ones are not found). */
export async function findOpenByTokenHash(db: Db, tokenHash: string, now: Date): Promise<InvitationRecord | undefined> {
  const rows = await db
    .select(columns)
    .from(workspaceInvitation)
    .innerJoin(workspace, eq(workspace.id, workspaceInvitation.workspaceId))
    .leftJoin(user, eq(user.id, workspaceInvitation.invitedBy))
    .where(and(eq(workspaceInvitation.tokenHash, tokenHash), open(now)));
  return rows[0];
}

export async function findOpenById(db: Db, workspaceId: string, id: string, now: Date): Promise<InvitationRecord | undefined> {
  const rows = await db
    .select(columns)
    .from(workspaceInvitation)
    .innerJoin(workspace, eq(workspace.id, workspaceInvitation.workspaceId))
    .leftJoin(user, eq(user.id, workspaceInvitation.invitedBy))
    .where(and(eq(workspaceInvitation.id, id), eq(workspaceInvitation.workspaceId, workspaceId), open(now)));
  return rows[0];
}

/** Open invitations of a workspace, newest first. */
export async function listOpen(db: Db, workspaceId: string, now: Date): Promise<InvitationRecord[]> {
  return db
    .select(columns)
    .from(workspaceInvitation)
    .innerJoin(workspace, eq(workspace.id, workspaceInvitation.workspaceId))
    .leftJoin(user, eq(user.id, workspaceInvitation.invitedBy))
    .where(and(eq(workspaceInvitation.workspaceId, workspaceId), open(now)))
    .orderBy(desc(workspaceInvitation.createdAt));
}

/** Revokes: the row goes, so the link stops working at once. */
export async function deleteInvitation(db: Db, id: string): Promise<void> {
  await db.delete(workspaceInvitation).where(eq(workspaceInvitation.id, id));
}

/**
 * Uses up an open invitation and adds the membership in one transaction. Of two
 * concurrent accepts only one finds the row still open; the other gets undefined.
 * An existing membership is kept as it is.
 */
export async function acceptInvitation(db: Db, id: string, userId: string, now: Date): Promise<{ workspaceId: string; role: WorkspaceRole } | undefined> {
  return db.transaction(async (tx) => {
    const [used] = await tx
      .update(workspaceInvitation)
      .set({ acceptedAt: now, acceptedBy: userId })
      .where(and(eq(workspaceInvitation.id, id), open(now)))
      .returning({ workspaceId: workspaceInvitation.workspaceId, role: workspaceInvitation.role });
    if (!used) return undefined;
    await tx.insert(workspaceMember).values({ workspaceId: used.workspaceId, userId, role: used.role }).onConflictDoNothing();
    const [member] = await tx
      .select({ role: workspaceMember.role })
      .from(workspaceMember)
      .where(and(eq(workspaceMember.workspaceId, used.workspaceId), eq(workspaceMember.userId, userId)));
    return { workspaceId: used.workspaceId, role: member!.role };
  });
}
