import { z } from 'zod';
import { notebookDocumentSchema } from '../notebook/document.js';
import { idSchema, isoDateSchema } from './common.js';
import { snapshotSchema } from './snapshots.js';

/** A share token: 32 url-safe characters. */
export const shareTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{16,64}$/, 'not a share token');

/** Route params of `/api/shares/:token` and `/api/shared/:token`. */
export const shareTokenParamsSchema = z.object({ token: shareTokenSchema });

/**
 * POST /api/notebooks/:id/shares (owner, workspace admin/analyst, editor grant):
 * makes a read-only link. `membersOnly` links open only for signed-in members of the
 * notebook's workspace (and people with a grant on it). Answers 201 with a {@link ShareLink}.
 */
export const createShareBodySchema = z.object({ membersOnly: z.boolean().default(false) }).default({ membersOnly: false });
export type CreateShareBody = z.infer<typeof createShareBodySchema>;

/** A share link. `url` is the page a person opens (`<BASE_URL>/shared/<token>`). */
export const shareLinkSchema = z.object({
  token: shareTokenSchema,
  url: z.string(),
  notebookId: idSchema,
  membersOnly: z.boolean(),
  createdBy: z.object({ id: idSchema, name: z.string() }).nullable(),
  createdAt: isoDateSchema,
});
export type ShareLink = z.infer<typeof shareLinkSchema>;

/** GET /api/notebooks/:id/shares (same people as create): live links, newest first. DELETE /api/shares/:token revokes (204). */
export const shareListResponseSchema = z.object({ shares: z.array(shareLinkSchema) });
export type ShareListResponse = z.infer<typeof shareListResponseSchema>;

/**
 * GET /api/shared/:token (no sign-in needed unless `membersOnly`): the notebook
 * read-only, with the newest snapshot (latest run, else its publication) if any.
 * A revoked or unknown token answers 404; a members-only link answers 401 signed out
 * and 404 to a signed-in non-member.
 */
export const sharedNotebookResponseSchema = z.object({
  token: shareTokenSchema,
  membersOnly: z.boolean(),
  notebook: z.object({
    id: idSchema,
    title: z.string(),
    workspaceName: z.string(),
    ownerName: z.string(),
    revision: z.number().int().positive(),
    updatedAt: isoDateSchema,
  }),
  document: notebookDocumentSchema,
  snapshot: snapshotSchema.nullable(),
  /** Where `snapshot` came from. */
  snapshotSource: z.enum(['run', 'publication']).nullable(),
});
export type SharedNotebookResponse = z.infer<typeof sharedNotebookResponseSchema>;
