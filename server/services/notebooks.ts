import type {
  CreateNotebookBody,
  NotebookAccessResponse,
  NotebookListItem,
  NotebookMeta,
  NotebookResponse,
  PutNotebookAccessBody,
  RevisionResponse,
  RevisionSummary,
  SaveNotebookBody,
} from '../../shared/api/notebooks.js';
import type { NotebookDocument } from '../../shared/notebook/document.js';
import { migrateNotebookDocument } from '../../shared/notebook/migrate-document.js';
import type { Db } from '../db/client.js';
import * as repo from '../db/repositories/notebooks.js';
import { listRuns } from '../db/repositories/runs.js';
import { findUploads, userCanSeeUpload } from '../db/repositories/uploads.js';
import { findUsersByEmails } from '../db/repositories/users.js';
import { findRole } from '../db/repositories/workspaces.js';
import { AppError, notFound } from '../errors.js';
import { assertNotebook, assertWorkspace, effectiveNotebookRole, notebookAllows, type NotebookAction } from './policy.js';
import { recordingFactsOf } from './recording-facts.js';
import { assertStorableJson } from './storable-json.js';

/**
 * Every notebook the caller can read, with each input slot's label and the device of the
 * recording bound to it (read from the file, see recording-facts.ts) and the last run, so
 * the library can filter by device and by run without opening each notebook.
 */
export async function listNotebooks(db: Db, userId: string, workspaceId?: string): Promise<NotebookListItem[]> {
  const rows = await repo.listNotebooksForUser(db, userId, workspaceId);
  const slotsOf = new Map<string, NotebookDocument['slots']>();
  for (const nb of rows) {
    const rev = await repo.findRevisionDocument(db, nb.id, nb.currentRevision);
    slotsOf.set(nb.id, rev ? readDocument(rev.document).slots : []);
  }
  const boundIds = [...new Set([...slotsOf.values()].flatMap((slots) => slots.map((s) => s.uploadId)).filter((id): id is string => id !== null))];
  const uploads = new Map((await findUploads(db, boundIds)).map((u) => [u.id, u]));
  const items: NotebookListItem[] = [];
  for (const nb of rows) {
    const inputs: NotebookListItem['inputs'] = [];
    for (const s of slotsOf.get(nb.id) ?? []) {
      const bound = s.uploadId ? uploads.get(s.uploadId) : undefined;
      const facts = bound ? await recordingFactsOf(db, bound) : null;
      inputs.push({ slot: s.name, label: s.label || s.name, fileName: bound?.fileName ?? null, device: facts?.device ?? null });
    }
    const [lastRun] = await listRuns(db, nb.id);
    items.push({ ...toMeta(nb), inputs, lastRunAt: lastRun ? lastRun.createdAt.toISOString() : null });
  }
  return items;
}

export async function createNotebook(db: Db, userId: string, body: CreateNotebookBody): Promise<NotebookResponse> {
  assertWorkspace(await findRole(db, body.workspaceId, userId), 'create');
  assertStorableJson(body.document, 'document');
  await assertUploadsVisible(db, userId, body.document);
  const id = await repo.insertNotebook(db, {
    workspaceId: body.workspaceId,
    ownerId: userId,
    title: body.document.title,
    document: body.document,
    summary: 'Created',
  });
  return getNotebook(db, userId, id);
}

export async function getNotebook(db: Db, userId: string, notebookId: string): Promise<NotebookResponse> {
  const nb = await reach(db, userId, notebookId, 'read');
  const rev = await repo.findRevisionDocument(db, notebookId, nb.currentRevision);
  if (!rev) throw new Error(`notebook ${notebookId} has no row for its current revision ${nb.currentRevision}`);
  return { notebook: toMeta(nb), revision: nb.currentRevision, document: readDocument(rev.document) };
}

/** Saves a new revision; a stale base answers 409 and writes nothing. */
export async function saveNotebook(db: Db, userId: string, notebookId: string, body: SaveNotebookBody): Promise<NotebookResponse> {
  const nb = await reach(db, userId, notebookId, 'edit');
  assertStorableJson(body.document, 'document');
  assertStorableJson(body.summary ?? '', 'summary');
  await assertUploadsVisible(db, userId, body.document);
  const written = await append(db, userId, notebookId, body.baseRevision, body.document, body.summary ?? '');
  return savedAnswer(nb, written, body.document);
}

export async function deleteNotebook(db: Db, userId: string, notebookId: string): Promise<void> {
  await reach(db, userId, notebookId, 'manage');
  await repo.deleteNotebook(db, notebookId);
}

export async function listRevisions(db: Db, userId: string, notebookId: string): Promise<RevisionSummary[]> {
  await reach(db, userId, notebookId, 'read');
  return (await repo.listRevisions(db, notebookId)).map(toRevisionSummary);
}

export async function getRevision(db: Db, userId: string, notebookId: string, revision: number): Promise<RevisionResponse> {
  await reach(db, userId, notebookId, 'read');
  const rev = await repo.findRevisionDocument(db, notebookId, revision);
  if (!rev) throw notFound(`Revision ${revision}`);
  return { ...toRevisionSummary(rev), document: readDocument(rev.document) };
}

/** Copies an old revision into a new one on top of the current revision. */
export async function restoreRevision(db: Db, userId: string, notebookId: string, revision: number, summary?: string): Promise<NotebookResponse> {
  const nb = await reach(db, userId, notebookId, 'edit');
  assertStorableJson(summary ?? '', 'summary');
  const rev = await repo.findRevisionDocument(db, notebookId, revision);
  if (!rev) throw notFound(`Revision ${revision}`);
  const document = readDocument(rev.document);
  const written = await append(db, userId, notebookId, nb.currentRevision, document, summary ?? `Restored revision ${revision}`);
  return savedAnswer(nb, written, document);
}

export async function getAccess(db: Db, userId: string, notebookId: string): Promise<NotebookAccessResponse> {
  await reach(db, userId, notebookId, 'read');
  return { grants: (await repo.listGrants(db, notebookId)).map(toGrant) };
}

/** Replaces the non-owner grants; every e-mail must belong to an account. */
export async function putAccess(db: Db, userId: string, notebookId: string, body: PutNotebookAccessBody): Promise<NotebookAccessResponse> {
  await reach(db, userId, notebookId, 'manage');
  const byEmail = new Map<string, 'editor' | 'viewer'>();
  for (const g of body.grants) byEmail.set(g.email.toLowerCase(), g.role);
  const users = await findUsersByEmails(db, [...byEmail.keys()]);
  const missing = [...byEmail.keys()].filter((e) => !users.some((u) => u.email === e));
  if (missing.length > 0) {
    throw new AppError(404, 'user_not_found', `No account uses ${missing.join(', ')}. Ask them to sign up first.`, { emails: missing });
  }
  await repo.replaceGrants(db, notebookId, users.map((u) => ({ userId: u.id, role: byEmail.get(u.email)! })));
  return { grants: (await repo.listGrants(db, notebookId)).map(toGrant) };
}

/**
 * A slot may only bind an upload the caller can already read: otherwise binding a
 * guessed or leaked id of another workspace would make its bytes readable through the
 * notebook. Answers 404 like any other id the caller cannot see.
 */
async function assertUploadsVisible(db: Db, userId: string, document: NotebookDocument): Promise<void> {
  for (const slot of document.slots) {
    if (slot.uploadId !== null && !(await userCanSeeUpload(db, slot.uploadId, userId))) throw notFound('Upload');
  }
}

async function reach(db: Db, userId: string, notebookId: string, action: NotebookAction): Promise<repo.NotebookAccessRecord> {
  const nb = await repo.findNotebookForUser(db, notebookId, userId);
  assertNotebook(nb ?? undefined, action);
  return nb!;
}

/** Appends a revision on `base` and answers its number and time; 409 when `base` is no longer the current one. */
async function append(
  db: Db,
  userId: string,
  notebookId: string,
  base: number,
  document: NotebookDocument,
  summary: string,
): Promise<{ revision: number; updatedAt: Date }> {
  const result = await repo.appendRevision(db, { notebookId, baseRevision: base, title: document.title, document, authorId: userId, summary });
  if (!result.saved) {
    throw new AppError(
      409,
      'stale_revision',
      `This notebook was saved elsewhere meanwhile (it is now at revision ${result.currentRevision}; your changes were made on revision ${base}). Nothing was overwritten: reload it and apply your changes again.`,
      { currentRevision: result.currentRevision, baseRevision: base },
    );
  }
  return { revision: result.revision, updatedAt: result.updatedAt };
}

/**
 * The answer to a save: the notebook as of the revision that save wrote, built from what
 * was written (the document is the one just stored, already in the current format) and
 * the access checked before writing, without reading anything back. Reading the head
 * instead would hand over a collaborator's revision saved in the meantime, and the editor
 * would build its next save on it and overwrite that revision without a 409.
 */
function savedAnswer(nb: repo.NotebookAccessRecord, written: { revision: number; updatedAt: Date }, document: NotebookDocument): NotebookResponse {
  const meta = toMeta({ ...nb, title: document.title, currentRevision: written.revision, updatedAt: written.updatedAt });
  return { notebook: meta, revision: written.revision, document };
}

/** Stored documents may be of an older format version: bring them to the current one. */
function readDocument(stored: unknown): NotebookDocument {
  return migrateNotebookDocument(stored);
}

function toMeta(nb: repo.NotebookAccessRecord): NotebookMeta {
  const reachInfo = { workspaceRole: nb.workspaceRole, grant: nb.grant };
  return {
    id: nb.id,
    title: nb.title,
    workspace: { id: nb.workspaceId, name: nb.workspaceName },
    owner: { id: nb.ownerId, name: nb.ownerName },
    role: effectiveNotebookRole(reachInfo),
    permissions: { edit: notebookAllows(reachInfo, 'edit'), manage: notebookAllows(reachInfo, 'manage') },
    revision: nb.currentRevision,
    forkedFrom: nb.forkedFromNotebookId
      ? { notebookId: nb.forkedFromNotebookId, id: nb.forkedFromNotebookId, title: nb.forkedFromTitle, revision: nb.forkedFromRevision ?? 1 }
      : null,
    createdAt: nb.createdAt.toISOString(),
    updatedAt: nb.updatedAt.toISOString(),
  };
}

function toRevisionSummary(r: repo.RevisionRecord): RevisionSummary {
  return {
    revision: r.revision,
    author: r.authorId ? { id: r.authorId, name: r.authorName ?? '' } : null,
    summary: r.summary,
    createdAt: r.createdAt.toISOString(),
  };
}

function toGrant(g: repo.GrantRecord) {
  return { user: { id: g.userId, name: g.name, email: g.email }, role: g.role };
}
