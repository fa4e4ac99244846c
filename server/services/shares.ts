import { randomBytes } from 'node:crypto';
import type { CreateShareBody, ShareLink, SharedNotebookResponse } from '../../shared/api/shares.js';
import type { Snapshot } from '../../shared/api/snapshots.js';
import type { Db } from '../db/client.js';
import { findNotebookForUser, type NotebookAccessRecord } from '../db/repositories/notebooks.js';
import { publicationSnapshotOf } from '../db/repositories/publications.js';
import { latestRunSnapshot } from '../db/repositories/runs.js';
import * as repo from '../db/repositories/shares.js';
import { notFound } from '../errors.js';
import { assertNotebook, assertShareOpens } from './policy.js';
import { revisionDocument } from './snapshot.js';

/** 24 random bytes: 32 url-safe characters, not guessable. */
const newToken = () => randomBytes(24).toString('base64url');

export async function createShare(db: Db, userId: string, notebookId: string, body: CreateShareBody, baseUrl: string): Promise<ShareLink> {
  assertNotebook(await findNotebookForUser(db, notebookId, userId), 'edit');
  const token = newToken();
  await repo.insertShare(db, { token, notebookId, membersOnly: body.membersOnly, createdBy: userId });
  return toLink((await repo.findShare(db, token))!, baseUrl);
}

export async function listShares(db: Db, userId: string, notebookId: string, baseUrl: string): Promise<ShareLink[]> {
  assertNotebook(await findNotebookForUser(db, notebookId, userId), 'edit');
  return (await repo.listShares(db, notebookId)).map((s) => toLink(s, baseUrl));
}

/** Revokes a link. Unknown tokens and links of notebooks the caller cannot read answer 404. */
export async function revokeShare(db: Db, userId: string, token: string): Promise<void> {
  const share = await repo.findShare(db, token);
  if (!share) throw notFound('Share link');
  const nb = await findNotebookForUser(db, share.notebookId, userId);
  if (!nb) throw notFound('Share link');
  assertNotebook(nb, 'edit');
  await repo.deleteShare(db, token);
}

/** The notebook behind a live token, for its holder (see assertShareOpens for members-only links). */
export async function openShare(db: Db, userId: string | null, token: string): Promise<{ share: repo.ShareRecord; notebook: NotebookAccessRecord }> {
  const share = await repo.findShare(db, token);
  // The caller's own reach is looked up with a user id that matches nobody when signed out.
  const notebook = share ? await findNotebookForUser(db, share.notebookId, userId ?? '') : undefined;
  assertShareOpens(share, { signedIn: userId !== null, reach: notebook });
  if (!share || !notebook) throw notFound('Share link');
  return { share, notebook };
}

/** GET /api/shared/:token: the document read-only and the newest snapshot. */
export async function readShared(db: Db, userId: string | null, token: string): Promise<SharedNotebookResponse> {
  const { share, notebook } = await openShare(db, userId, token);
  const document = await revisionDocument(db, notebook.id, notebook.currentRevision);
  const run = await latestRunSnapshot(db, notebook.id);
  const published = run ? undefined : await publicationSnapshotOf(db, notebook.id);
  return {
    token,
    membersOnly: share.membersOnly,
    notebook: {
      id: notebook.id,
      title: notebook.title,
      workspaceName: notebook.workspaceName,
      ownerName: notebook.ownerName,
      revision: notebook.currentRevision,
      updatedAt: notebook.updatedAt.toISOString(),
    },
    document,
    snapshot: ((run?.snapshot ?? published) as Snapshot | undefined) ?? null,
    snapshotSource: run ? 'run' : published ? 'publication' : null,
  };
}

function toLink(s: repo.ShareRecord, baseUrl: string): ShareLink {
  return {
    token: s.token,
    url: `${baseUrl}/shared/${s.token}`,
    notebookId: s.notebookId,
    membersOnly: s.membersOnly,
    createdBy: s.createdBy ? { id: s.createdBy, name: s.createdByName ?? '' } : null,
    createdAt: s.createdAt.toISOString(),
  };
}
