import { z } from 'zod';
import { idSchema, isoDateSchema } from './common.js';

/** File formats the server accepts, decided by content, not by extension. */
export const recordingFormatSchema = z.enum(['fit', 'csv']);
export type RecordingFormat = z.infer<typeof recordingFormatSchema>;

/** A non-fatal remark about an uploaded file (same shape as the engine's EngineWarning). */
export const uploadWarningSchema = z.object({ code: z.string(), message: z.string() });

/** Metadata of a stored upload. GET /api/uploads/:id */
export const uploadMetaSchema = z.object({
  id: idSchema,
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  /** Name of the file as first uploaded. */
  fileName: z.string(),
  size: z.number().int().nonnegative(),
  format: recordingFormatSchema,
  workspaceId: idSchema,
  uploadedBy: idSchema.nullable(),
  warnings: z.array(uploadWarningSchema),
  createdAt: isoDateSchema,
});
export type UploadMeta = z.infer<typeof uploadMetaSchema>;

/**
 * Text fields of POST /api/uploads (multipart/form-data, one or more parts named
 * `file`). `workspaceId` defaults to the caller's first workspace where they may
 * create notebooks.
 */
export const uploadFieldsSchema = z.object({ workspaceId: idSchema.optional() });
export type UploadFields = z.infer<typeof uploadFieldsSchema>;

/**
 * Answer of POST /api/uploads (201), one entry per file part in order. The same
 * bytes uploaded again give the same id with `duplicate: true`.
 */
export const uploadResponseSchema = z.object({
  uploads: z.array(uploadMetaSchema.extend({ duplicate: z.boolean() })),
});
export type UploadResponse = z.infer<typeof uploadResponseSchema>;
