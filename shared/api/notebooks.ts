import { z } from 'zod';
import { notebookDocumentSchema } from '../notebook/document.js';
import { idSchema, isoDateSchema, userRefSchema } from './common.js';
import { recordingDeviceSchema } from './uploads.js';

/** A per-notebook grant. The creator holds `owner`; others get `editor` or `viewer`. */
export const notebookRoleSchema = z.enum(['owner', 'editor', 'viewer']);
export type NotebookRole = z.infer<typeof notebookRoleSchema>;

/** What the caller may do with one notebook, worked out by the server's policy. */
export const notebookPermissionsSchema = z.object({
  edit: z.boolean(),
  /** Change grants (GET/PUT access) and delete the notebook. */
  manage: z.boolean(),
});
export type NotebookPermissions = z.infer<typeof notebookPermissionsSchema>;

/**
 * Where a fork came from; null for an original. `id` repeats `notebookId`; `title` is
 * the origin's current title, null once the origin was deleted.
 */
export const forkOriginSchema = z
  .object({ notebookId: idSchema, id: idSchema, title: z.string().nullable(), revision: z.number().int().positive() })
  .nullable();

/** Notebook metadata as lists and detail views show it. */
export const notebookMetaSchema = z.object({
  id: idSchema,
  title: z.string(),
  workspace: z.object({ id: idSchema, name: z.string() }),
  owner: z.object({ id: idSchema, name: z.string() }),
  /** The caller's effective role: `owner`, `editor` (grant or workspace admin/analyst) or `viewer`. */
  role: notebookRoleSchema,
  permissions: notebookPermissionsSchema,
  /** Number of the current revision (1 for a new notebook). */
  revision: z.number().int().positive(),
  forkedFrom: forkOriginSchema,
  createdAt: isoDateSchema,
  updatedAt: isoDateSchema,
});
export type NotebookMeta = z.infer<typeof notebookMetaSchema>;

/** Optional filter of GET /api/notebooks. */
export const notebookListQuerySchema = z.object({ workspaceId: idSchema.optional() });
export type NotebookListQuery = z.infer<typeof notebookListQuerySchema>;

/** One input slot of a listed notebook: its label and the recording bound to it, if any. */
export const notebookListInputSchema = z.object({
  slot: z.string(),
  label: z.string(),
  /** Null when nothing is bound. */
  fileName: z.string().nullable(),
  /** Who recorded the bound file, as the file says; null when unbound or not stated. */
  device: recordingDeviceSchema.nullable(),
});
export type NotebookListInput = z.infer<typeof notebookListInputSchema>;

/** A notebook as the library lists it: its metadata, its inputs, and when it last ran headless. */
export const notebookListItemSchema = notebookMetaSchema.extend({
  inputs: z.array(notebookListInputSchema),
  /** Newest saved run (POST .../runs); null when it never ran on the server. */
  lastRunAt: isoDateSchema.nullable(),
});
export type NotebookListItem = z.infer<typeof notebookListItemSchema>;

/** GET /api/notebooks: every notebook the caller can read, most recently updated first. */
export const notebookListResponseSchema = z.object({ notebooks: z.array(notebookListItemSchema) });
export type NotebookListResponse = z.infer<typeof notebookListResponseSchema>;

/** POST /api/notebooks: answers 201 with a {@link NotebookResponse} at revision 1. */
export const createNotebookBodySchema = z.object({
  workspaceId: idSchema,
  document: notebookDocumentSchema,
});
export type CreateNotebookBody = z.infer<typeof createNotebookBodySchema>;

/** GET /api/notebooks/:id, and the answer of every call that writes a revision. */
export const notebookResponseSchema = z.object({
  notebook: notebookMetaSchema,
  revision: z.number().int().positive(),
  document: notebookDocumentSchema,
});
export type NotebookResponse = z.infer<typeof notebookResponseSchema>;

/**
 * PUT /api/notebooks/:id: saves a new revision on top of `baseRevision`.
 * When someone else saved first, answers 409 `stale_revision` with
 * {@link StaleRevisionDetails} and writes nothing.
 */
export const saveNotebookBodySchema = z.object({
  baseRevision: z.number().int().positive(),
  document: notebookDocumentSchema,
  summary: z.string().max(500).optional(),
});
export type SaveNotebookBody = z.infer<typeof saveNotebookBodySchema>;

/** `details` of a 409 `stale_revision` error. */
export const staleRevisionDetailsSchema = z.object({
  currentRevision: z.number().int().positive(),
  baseRevision: z.number().int().positive(),
});
export type StaleRevisionDetails = z.infer<typeof staleRevisionDetailsSchema>;

/** One entry of the revision history. */
export const revisionSummarySchema = z.object({
  revision: z.number().int().positive(),
  /** Null when the author's account was deleted. */
  author: z.object({ id: idSchema, name: z.string() }).nullable(),
  summary: z.string(),
  createdAt: isoDateSchema,
});
export type RevisionSummary = z.infer<typeof revisionSummarySchema>;

/** GET /api/notebooks/:id/revisions: newest first. */
export const revisionListResponseSchema = z.object({ revisions: z.array(revisionSummarySchema) });
export type RevisionListResponse = z.infer<typeof revisionListResponseSchema>;

/** Route params of `/api/notebooks/:id/revisions/:rev`. */
export const revisionParamsSchema = z.object({ id: idSchema, rev: z.coerce.number().int().positive() });

/** GET /api/notebooks/:id/revisions/:rev */
export const revisionResponseSchema = revisionSummarySchema.extend({ document: notebookDocumentSchema });
export type RevisionResponse = z.infer<typeof revisionResponseSchema>;

/**
 * POST /api/notebooks/:id/revisions/:rev/restore: copies revision `rev` into a new
 * revision (history is never rewritten). Body optional. Answers a {@link NotebookResponse}.
 */
export const restoreRevisionBodySchema = z
  .object({ summary: z.string().max(500).optional() })
  .optional()
  .default({});
export type RestoreRevisionBody = z.infer<typeof restoreRevisionBodySchema>;

/** One grant of a notebook. */
export const notebookGrantSchema = z.object({ user: userRefSchema, role: notebookRoleSchema });
export type NotebookGrant = z.infer<typeof notebookGrantSchema>;

/** GET /api/notebooks/:id/access (and the answer of PUT): owner first. */
export const notebookAccessResponseSchema = z.object({ grants: z.array(notebookGrantSchema) });
export type NotebookAccessResponse = z.infer<typeof notebookAccessResponseSchema>;

/**
 * PUT /api/notebooks/:id/access: replaces every non-owner grant. Users are named by
 * e-mail and must have an account; they need not be workspace members (a grant alone
 * lets an outside reviewer read or edit this one notebook). The owner is kept as is.
 */
export const putNotebookAccessBodySchema = z.object({
  grants: z
    .array(z.object({ email: z.email().max(254), role: z.enum(['editor', 'viewer']) }))
    .max(200),
});
export type PutNotebookAccessBody = z.infer<typeof putNotebookAccessBodySchema>;
