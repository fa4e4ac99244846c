import { randomBytes } from 'node:crypto';
import type { PublishBody, Publication, PublishedListResponse } from '../../shared/api/publications.js';
import type { Snapshot } from '../../shared/api/snapshots.js';
import { DEMO_PUBLISHED_NOTEBOOK } from '../../shared/demo/sample-files.js';
import type { Db } from '../db/client.js';
import { findNotebookForUser, listNotebooksForUser } from '../db/repositories/notebooks.js';
import * as repo from '../db/repositories/publications.js';
import { readUploadBytes } from '../db/repositories/uploads.js';
import { notFound } from '../errors.js';
import { assertNotebook, assertPublishedDownload } from './policy.js';
import { forgetPublishedPage, publishedFiles } from './published-pages.js';
import type { DemoSeed, DemoServices } from './seed.js';
import { computeSnapshot, resolveBindings, revisionDocument } from './snapshot.js';

/**
 * Publishes the notebook's current revision: computes its snapshot on the server on
 * the uploads its slots bind (so the numbers come from stored inputs, not from a
 * browser), then stores or replaces the publication. The slug stays the same.
 */
export async function publish(db: Db, userId: string, notebookId: string, body: PublishBody, baseUrl: string): Promise<Publication> {
  const nb = await findNotebookForUser(db, notebookId, userId);
  assertNotebook(nb, 'edit');
  const document = await revisionDocument(db, notebookId, nb!.currentRevision);
  const bindings = await resolveBindings(db, document, {}, userId);
  // Charts drawn on the server too: the reader's page shows them without the chart library.
  const { snapshot } = await computeSnapshot(db, document, nb!.currentRevision, bindings, { drawCharts: true });
  const existing = await repo.findPublicationOfNotebook(db, notebookId);
  await repo.upsertPublication(db, {
    notebookId,
    slug: existing?.slug ?? newSlug(nb!.title),
    revision: nb!.currentRevision,
    snapshot,
    allowDownloads: body.allowDownloads,
    publishedBy: userId,
  });
  const published = (await repo.findPublicationOfNotebook(db, notebookId))!;
  forgetPublishedPage(db, published.slug);
  return toPublication(published, baseUrl);
}

/**
 * The notebook's publication, or null while it is not published. Not publishing is an
 * ordinary state of a notebook the reader may see, so it is no error; an unknown notebook,
 * or one the user may not read, still is (404 from the policy).
 */
export async function getPublication(db: Db, userId: string, notebookId: string, baseUrl: string): Promise<Publication | null> {
  assertNotebook(await findNotebookForUser(db, notebookId, userId), 'read');
  const found = await repo.findPublicationOfNotebook(db, notebookId);
  return found ? toPublication(found, baseUrl) : null;
}

export async function unpublish(db: Db, userId: string, notebookId: string): Promise<void> {
  assertNotebook(await findNotebookForUser(db, notebookId, userId), 'edit');
  const slug = await repo.deletePublication(db, notebookId);
  if (slug === null) throw notFound('Publication');
  forgetPublishedPage(db, slug);
}

export async function listPublished(db: Db): Promise<PublishedListResponse> {
  return {
    publications: (await repo.listPublications(db)).map((p) => ({
      slug: p.slug,
      title: p.title,
      publishedBy: p.publishedByName === null ? null : { name: p.publishedByName },
      publishedAt: p.publishedAt.toISOString(),
      revision: p.revision,
    })),
  };
}

/** A recording of a publication that allows downloads. */
export async function readPublishedFile(db: Db, slug: string, uploadId: string): Promise<{ fileName: string; bytes: Uint8Array }> {
  const found = await repo.findPublicationBySlug(db, slug);
  if (!found) throw notFound('Publication');
  const files = found.allowDownloads ? await publishedFiles(db, found.snapshot as Snapshot) : [];
  const file = files.find((f) => f.uploadId === uploadId);
  assertPublishedDownload(found.allowDownloads, file !== undefined);
  const bytes = await readUploadBytes(db, uploadId);
  if (!bytes) throw notFound('File');
  return { fileName: file!.fileName, bytes };
}

function newSlug(title: string): string {
  const words = title
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '');
  // A random tail: titles repeat, and a slug should not be guessable from a title alone.
  const tail = randomBytes(5).toString('hex');
  return words ? `${words}-${tail}` : tail;
}

function toPublication(p: repo.PublicationRecord, baseUrl: string): Publication {
  return {
    slug: p.slug,
    url: `${baseUrl}/published/${p.slug}`,
    notebookId: p.notebookId,
    title: p.title,
    revision: p.revision,
    publishedAt: p.publishedAt.toISOString(),
    publishedBy: p.publishedBy ? { id: p.publishedBy, name: p.publishedByName ?? '' } : null,
    allowDownloads: p.allowDownloads,
  };
}

/**
 * Demo seed step: publishes the demo notebook named by DEMO_PUBLISHED_NOTEBOOK as the
 * lab's analyst, so a signed-out visitor has a page to read at first start.
 */
export async function publishDemoNotebook(services: DemoServices, seed: DemoSeed): Promise<void> {
  const notebooks = await listNotebooksForUser(services.db, seed.users.analyst, seed.workspaceId);
  const target = notebooks.find((n) => n.title === DEMO_PUBLISHED_NOTEBOOK.title);
  if (!target) {
    services.logger.warn({ title: DEMO_PUBLISHED_NOTEBOOK.title }, 'demo notebook to publish not found');
    return;
  }
  const published = await publish(services.db, seed.users.analyst, target.id, { allowDownloads: true }, '');
  services.logger.info({ slug: published.slug }, 'demo notebook published');
}
