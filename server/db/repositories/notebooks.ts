import { and, desc, eq, ne, or, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { NotebookRole } from '../../../shared/api/notebooks.js';
import type { WorkspaceRole } from '../../../shared/api/workspaces.js';
import type { Db } from '../client.js';
import { notebook, notebookAccess, notebookRevision, user, workspace, workspaceMember } from '../schema.js';

export interface NotebookRecord {
  id: string;
  title: string;
  workspaceId: string;
  workspaceName: string;
  ownerId: string;
  ownerName: string;
  currentRevision: number;
  forkedFromNotebookId: string | null;
  forkedFromRevision: number | null;
  /** Current title of the origin of a fork (null when it was deleted or this is no fork). */
  forkedFromTitle: string | null;
  createdAt: Date;
  updatedAt: Date;
}

/** A notebook together with how one user reaches it. */
export interface NotebookAccessRecord extends NotebookRecord {
  workspaceRole: WorkspaceRole | null;
  grant: NotebookRole | null;
}

export interface RevisionRecord {
  revision: number;
  authorId: string | null;
  authorName: string | null;
  summary: string;
  createdAt: Date;
}

export interface GrantRecord {
  userId: string;
  name: string;
  email: string;
  role: NotebookRole;
}

const owner = alias(user, 'owner_user');
const origin = alias(notebook, 'origin_notebook');
const notebookColumns = {
  id: notebook.id,
  title: notebook.title,
  workspaceId: notebook.workspaceId,
  workspaceName: workspace.name,
  ownerId: notebook.ownerId,
  ownerName: owner.name,
  currentRevision: notebook.currentRevision,
  forkedFromNotebookId: notebook.forkedFromNotebookId,
  forkedFromRevision: notebook.forkedFromRevision,
  forkedFromTitle: origin.title,
  createdAt: notebook.createdAt,
  updatedAt: notebook.updatedAt,
};

/** Notebooks joined with workspace, owner, and the given user's membership and grant. */
function selectWithAccess(db: Db, userId: string) {
  return db
    .select({ ...notebookColumns, workspaceRole: workspaceMember.role, grant: notebookAccess.role })
    .from(notebook)
    .innerJoin(workspace, eq(workspace.id, notebook.workspaceId))
    .innerJoin(owner, eq(owner.id, notebook.ownerId))
    .leftJoin(origin, eq(origin.id, notebook.forkedFromNotebookId))
    .leftJoin(workspaceMember, and(eq(workspaceMember.workspaceId, notebook.workspaceId), eq(workspaceMember.userId, userId)))
    .leftJoin(notebookAccess, and(eq(notebookAccess.notebookId, notebook.id), eq(notebookAccess.userId, userId)));
}

export async function findNotebookForUser(db: Db, notebookId: string, userId: string): Promise<NotebookAccessRecord | undefined> {
  const rows = await selectWithAccess(db, userId).where(eq(notebook.id, notebookId));
  return rows[0];
}

/** Notebooks the user reaches through a membership or a grant, most recently updated first. */
export async function listNotebooksForUser(db: Db, userId: string, workspaceId?: string): Promise<NotebookAccessRecord[]> {
  const reachable = or(sql`${workspaceMember.role} is not null`, sql`${notebookAccess.role} is not null`);
  const where = workspaceId ? and(reachable, eq(notebook.workspaceId, workspaceId)) : reachable;
  return selectWithAccess(db, userId).where(where).orderBy(desc(notebook.updatedAt), desc(notebook.createdAt));
}

/** Creates a notebook at revision 1 with its owner grant. */
export async function insertNotebook(
  db: Db,
  input: {
    workspaceId: string;
    ownerId: string;
    title: string;
    document: unknown;
    summary: string;
    forkedFrom?: { notebookId: string; revision: number };
  },
): Promise<string> {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(notebook)
      .values({
        workspaceId: input.workspaceId,
        ownerId: input.ownerId,
        title: input.title,
        currentRevision: 1,
        forkedFromNotebookId: input.forkedFrom?.notebookId ?? null,
        forkedFromRevision: input.forkedFrom?.revision ?? null,
      })
      .returning({ id: notebook.id });
    const id = row!.id;
    await tx.insert(notebookRevision).values({ notebookId: id, revision: 1, document: input.document, authorId: input.ownerId, summary: input.summary });
    await tx.insert(notebookAccess).values({ notebookId: id, userId: input.ownerId, role: 'owner' });
    return id;
  });
}

/**
 * Appends revision `baseRevision + 1` if the notebook is still at `baseRevision`, in one
 * statement (one round trip, atomic by itself): the conditional update takes the row
 * lock, so of two concurrent saves on one base exactly one wins and inserts its revision;
 * the other gets `{ saved: false }` with the current number. Answers the time the
 * notebook was updated at.
 */
export async function appendRevision(
  db: Db,
  input: { notebookId: string; baseRevision: number; title: string; document: unknown; authorId: string; summary: string },
): Promise<{ saved: true; revision: number; updatedAt: Date } | { saved: false; currentRevision: number }> {
  const next = input.baseRevision + 1;
  const updatedAt = new Date();
  // Both drivers answer a raw statement with { rows }.
  const result = (await db.execute(sql`
    with moved as (
      update ${notebook} set current_revision = ${next}, title = ${input.title}, updated_at = ${updatedAt.toISOString()}::timestamptz
      where id = ${input.notebookId} and current_revision = ${input.baseRevision}
      returning id
    ), added as (
      insert into ${notebookRevision} (notebook_id, revision, document, author_id, summary)
      select id, ${next}, ${JSON.stringify(input.document)}::jsonb, ${input.authorId}, ${input.summary} from moved
      returning revision
    )
    select revision from added`)) as { rows: unknown[] };
  if (result.rows.length === 1) return { saved: true, revision: next, updatedAt };
  const rows = await db.select({ current: notebook.currentRevision }).from(notebook).where(eq(notebook.id, input.notebookId));
  return { saved: false, currentRevision: rows[0]?.current ?? 0 };
}

export async function findRevisionDocument(db: Db, notebookId: string, revision: number): Promise<(RevisionRecord & { document: unknown }) | undefined> {
  const rows = await db
    .select({
      revision: notebookRevision.revision,
      authorId: notebookRevision.authorId,
      authorName: user.name,
      summary: notebookRevision.summary,
      createdAt: notebookRevision.createdAt,
      document: notebookRevision.document,
    })
    .from(notebookRevision)
    .leftJoin(user, eq(user.id, notebookRevision.authorId))
    .where(and(eq(notebookRevision.notebookId, notebookId), eq(notebookRevision.revision, revision)));
  return rows[0];
}

export async function listRevisions(db: Db, notebookId: string): Promise<RevisionRecord[]> {
  return db
    .select({
      revision: notebookRevision.revision,
      authorId: notebookRevision.authorId,
      authorName: user.name,
      summary: notebookRevision.summary,
      createdAt: notebookRevision.createdAt,
    })
    .from(notebookRevision)
    .leftJoin(user, eq(user.id, notebookRevision.authorId))
    .where(eq(notebookRevision.notebookId, notebookId))
    .orderBy(desc(notebookRevision.revision));
}

export async function deleteNotebook(db: Db, notebookId: string): Promise<void> {
  await db.delete(notebook).where(eq(notebook.id, notebookId));
}

/** Grants of a notebook, owner first. */
export async function listGrants(db: Db, notebookId: string): Promise<GrantRecord[]> {
  return db
    .select({ userId: user.id, name: user.name, email: user.email, role: notebookAccess.role })
    .from(notebookAccess)
    .innerJoin(user, eq(user.id, notebookAccess.userId))
    .where(eq(notebookAccess.notebookId, notebookId))
    .orderBy(sql`case ${notebookAccess.role} when 'owner' then 0 when 'editor' then 1 else 2 end`, user.name);
}

/** Replaces every non-owner grant of a notebook in one transaction. */
export async function replaceGrants(
  db: Db,
  notebookId: string,
  grants: { userId: string; role: 'editor' | 'viewer' }[],
): Promise<void> {
  await db.transaction(async (tx) => {
    await tx.delete(notebookAccess).where(and(eq(notebookAccess.notebookId, notebookId), ne(notebookAccess.role, 'owner')));
    const owners = await tx
      .select({ userId: notebookAccess.userId })
      .from(notebookAccess)
      .where(eq(notebookAccess.notebookId, notebookId));
    const ownerIds = new Set(owners.map((o) => o.userId));
    const rows = grants.filter((g) => !ownerIds.has(g.userId)).map((g) => ({ notebookId, userId: g.userId, role: g.role }));
    if (rows.length > 0) await tx.insert(notebookAccess).values(rows);
  });
}
