import type { ForkBody } from '../../shared/api/forks.js';
import type { NotebookResponse } from '../../shared/api/notebooks.js';
import type { Db } from '../db/client.js';
import { findNotebookForUser, insertNotebook, type NotebookAccessRecord } from '../db/repositories/notebooks.js';
import { findRole } from '../db/repositories/workspaces.js';
import { getNotebook } from './notebooks.js';
import { assertNotebook, assertWorkspace } from './policy.js';
import { openShare } from './shares.js';
import { revisionDocument } from './snapshot.js';

/** Forks a notebook the caller can read into a workspace where they may create notebooks. */
export async function forkNotebook(db: Db, userId: string, notebookId: string, body: ForkBody): Promise<NotebookResponse> {
  const nb = await findNotebookForUser(db, notebookId, userId);
  assertNotebook(nb, 'read');
  return fork(db, userId, nb!, body);
}

/** Forks the notebook behind a live share token (members-only links: members only). */
export async function forkShared(db: Db, userId: string, token: string, body: ForkBody): Promise<NotebookResponse> {
  const { notebook } = await openShare(db, userId, token);
  return fork(db, userId, notebook, body);
}

/**
 * Copies the current revision into a new notebook at revision 1. The copy binds the
 * same stored uploads (bytes are never copied); the forker may read them because a
 * notebook they can read binds them. The original is not touched.
 */
async function fork(db: Db, userId: string, origin: NotebookAccessRecord, body: ForkBody): Promise<NotebookResponse> {
  assertWorkspace(await findRole(db, body.workspaceId, userId), 'create');
  const document = await revisionDocument(db, origin.id, origin.currentRevision);
  const title = body.title ?? `${origin.title} (copy)`.slice(0, 200);
  const id = await insertNotebook(db, {
    workspaceId: body.workspaceId,
    ownerId: userId,
    title,
    document: { ...document, title },
    summary: `Forked from "${origin.title}" revision ${origin.currentRevision}`,
    forkedFrom: { notebookId: origin.id, revision: origin.currentRevision },
  });
  return getNotebook(db, userId, id);
}
