import { and, desc, eq, sql } from 'drizzle-orm';
import type { Db } from '../client.js';
import { notebook, publication, user } from '../schema.js';

export interface PublicationRecord {
  notebookId: string;
  slug: string;
  title: string;
  revision: number;
  allowDownloads: boolean;
  publishedBy: string | null;
  publishedByName: string | null;
  publishedAt: Date;
}

const columns = {
  notebookId: publication.notebookId,
  slug: publication.slug,
  title: notebook.title,
  revision: publication.revision,
  allowDownloads: publication.allowDownloads,
  publishedBy: publication.publishedBy,
  publishedByName: user.name,
  publishedAt: publication.publishedAt,
};

function select(db: Db) {
  return db
    .select(columns)
    .from(publication)
    .innerJoin(notebook, eq(notebook.id, publication.notebookId))
    .leftJoin(user, eq(user.id, publication.publishedBy));
}

export async function findPublicationOfNotebook(db: Db, notebookId: string): Promise<PublicationRecord | undefined> {
  return (await select(db).where(eq(publication.notebookId, notebookId)))[0];
}

/** The publication at `slug` without its snapshot: the cheap check a cached page is still current. */
export async function findPublicationMetaBySlug(db: Db, slug: string): Promise<PublicationRecord | undefined> {
  return (await select(db).where(eq(publication.slug, slug)))[0];
}

export async function findPublicationBySlug(db: Db, slug: string): Promise<(PublicationRecord & { snapshot: unknown }) | undefined> {
  const rows = await db
    .select({ ...columns, snapshot: publication.snapshot })
    .from(publication)
    .innerJoin(notebook, eq(notebook.id, publication.notebookId))
    .leftJoin(user, eq(user.id, publication.publishedBy))
    .where(eq(publication.slug, slug));
  return rows[0];
}

export async function publicationSnapshotOf(db: Db, notebookId: string): Promise<unknown> {
  const rows = await db.select({ snapshot: publication.snapshot }).from(publication).where(eq(publication.notebookId, notebookId));
  return rows[0]?.snapshot;
}

export async function listPublications(db: Db): Promise<PublicationRecord[]> {
  return select(db).orderBy(desc(publication.publishedAt));
}

/** Publishes or replaces the publication of a notebook; an existing slug is kept. */
export async function upsertPublication(
  db: Db,
  input: { notebookId: string; slug: string; revision: number; snapshot: unknown; allowDownloads: boolean; publishedBy: string },
): Promise<void> {
  await db
    .insert(publication)
    .values({ ...input, publishedAt: new Date() })
    .onConflictDoUpdate({
      target: publication.notebookId,
      set: { revision: input.revision, snapshot: input.snapshot, allowDownloads: input.allowDownloads, publishedBy: input.publishedBy, publishedAt: new Date() },
    });
}

/**
 * Replaces the snapshot of one publication, identified by its publishing time as well as its
 * notebook: answers false (and changes nothing) when it was republished or unpublished since.
 */
export async function replacePublicationSnapshot(db: Db, notebookId: string, publishedAt: Date, snapshot: unknown): Promise<boolean> {
  const rows = await db
    .update(publication)
    .set({ snapshot })
    // The database keeps microseconds, a Date milliseconds: a row written by SQL's now() must still match.
    .where(and(eq(publication.notebookId, notebookId), sql`date_trunc('milliseconds', ${publication.publishedAt}) = ${publishedAt.toISOString()}::timestamptz`))
    .returning({ slug: publication.slug });
  return rows.length > 0;
}

/** Unpublishes a notebook; answers the slug it had, or null when it was not published. */
export async function deletePublication(db: Db, notebookId: string): Promise<string | null> {
  const rows = await db.delete(publication).where(eq(publication.notebookId, notebookId)).returning({ slug: publication.slug });
  return rows[0]?.slug ?? null;
}
