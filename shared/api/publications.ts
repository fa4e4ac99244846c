import { z } from 'zod';
import { idSchema, isoDateSchema } from './common.js';
import { snapshotSchema } from './snapshots.js';
import { recordingFormatSchema } from './uploads.js';

/** A publication's address part: lower-case words and a short random tail. */
export const publicationSlugSchema = z.string().regex(/^[a-z0-9][a-z0-9-]{0,99}$/, 'not a publication slug');
export const publicationSlugParamsSchema = z.object({ slug: publicationSlugSchema });
export const publishedFileParamsSchema = z.object({ slug: publicationSlugSchema, uploadId: idSchema });

/**
 * POST /api/notebooks/:id/publication (editors): computes a snapshot of the current
 * revision on its bound uploads, on the server, and publishes it for anyone with the
 * address. Publishing again replaces the snapshot and keeps the slug. Answers 200 with
 * a {@link Publication}. DELETE /api/notebooks/:id/publication unpublishes (204).
 */
export const publishBodySchema = z.object({ allowDownloads: z.boolean().default(false) }).default({ allowDownloads: false });
export type PublishBody = z.infer<typeof publishBodySchema>;

/**
 * The publication of a notebook as its editors see it. GET /api/notebooks/:id/publication
 * (readers) answers 200 with a Publication, or 200 with `null` while the notebook is not
 * published; 404 only for an unknown notebook or one the user may not read.
 */
export const publicationSchema = z.object({
  slug: publicationSlugSchema,
  /** The reader's page (`<BASE_URL>/published/<slug>`). */
  url: z.string(),
  notebookId: idSchema,
  title: z.string(),
  revision: z.number().int().positive(),
  publishedAt: isoDateSchema,
  publishedBy: z.object({ id: idSchema, name: z.string() }).nullable(),
  allowDownloads: z.boolean(),
});
export type Publication = z.infer<typeof publicationSchema>;

/** The answer of GET /api/notebooks/:id/publication: the publication, or null when unpublished. */
export const publicationResponseSchema = publicationSchema.nullable();
export type PublicationResponse = z.infer<typeof publicationResponseSchema>;

/** A recording a reader may download: GET /api/published/:slug/files/:uploadId. */
export const publishedFileSchema = z.object({
  uploadId: idSchema,
  slot: z.string(),
  fileName: z.string(),
  format: recordingFormatSchema,
  size: z.number().int().nonnegative(),
});
export type PublishedFile = z.infer<typeof publishedFileSchema>;

/**
 * GET /api/published/:slug (public, no sign-in): what a reader sees. No upload ids and
 * no recording bytes unless the publisher allowed downloads (then `files`).
 */
export const publishedNotebookResponseSchema = z.object({
  slug: publicationSlugSchema,
  title: z.string(),
  description: z.string(),
  publishedBy: z.object({ name: z.string() }).nullable(),
  publishedAt: isoDateSchema,
  revision: z.number().int().positive(),
  snapshot: snapshotSchema,
  allowDownloads: z.boolean(),
  files: z.array(publishedFileSchema).nullable(),
});
export type PublishedNotebookResponse = z.infer<typeof publishedNotebookResponseSchema>;

/** GET /api/published (public): every publication, newest first. */
export const publishedListResponseSchema = z.object({
  publications: z.array(
    z.object({
      slug: publicationSlugSchema,
      title: z.string(),
      publishedBy: z.object({ name: z.string() }).nullable(),
      publishedAt: isoDateSchema,
      revision: z.number().int().positive(),
    }),
  ),
});
export type PublishedListResponse = z.infer<typeof publishedListResponseSchema>;
