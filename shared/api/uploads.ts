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
 * create notebooks; `readDamaged` accepts damaged FIT files.
 */
export const uploadFieldsSchema = z.object({
  workspaceId: idSchema.optional(),
  /**
   * "true": the person chose to keep a FIT file whose checksum fails or that is cut short
   * (stored with a warning; the importer then reads what is intact). Without it such a file is refused (415).
   */
  readDamaged: z.enum(['true', 'false']).optional(),
});
export type UploadFields = z.infer<typeof uploadFieldsSchema>;

/**
 * Answer of POST /api/uploads (201), one entry per file part in order. The same
 * bytes uploaded again give the same id with `duplicate: true`.
 */
export const uploadResponseSchema = z.object({
  uploads: z.array(uploadMetaSchema.extend({ duplicate: z.boolean() })),
});
export type UploadResponse = z.infer<typeof uploadResponseSchema>;

/**
 * Who recorded a file, as its content says (FIT file_id / device_info). Null fields are
 * not stated in the file; `name` is the one-line form lists show and filter on.
 */
export const recordingDeviceSchema = z.object({
  name: z.string(),
  manufacturer: z.string().nullable(),
  product: z.string().nullable(),
  serialNumber: z.number().nullable(),
});
export type RecordingDevice = z.infer<typeof recordingDeviceSchema>;

/**
 * One line for a device: maker, product and serial, as far as the file states them
 * ("maker #263" when only the numeric id is known). Null when the file states nothing.
 *
 * @example deviceDisplayName({ manufacturer: 'ridgeline', product: 'Spider PM', serialNumber: 4021 }) // 'ridgeline Spider PM · serial 4021'
 */
export function deviceDisplayName(d: { manufacturer?: string | null; manufacturerId?: number | null; product?: string | null; productId?: number | null; serialNumber?: number | null }): string | null {
  // FIT's "development" (id 255) says no registered maker: naming it would only add noise.
  const named = d.manufacturer === 'development' ? null : d.manufacturer;
  const maker = named ?? (d.manufacturerId != null && d.manufacturerId !== 255 ? `maker #${d.manufacturerId}` : null);
  const product = d.product ?? (d.productId != null ? `product #${d.productId}` : null);
  const head = [maker, product].filter(Boolean).join(' ');
  const parts = [head, d.serialNumber != null ? `serial ${d.serialNumber}` : ''].filter(Boolean);
  return parts.length > 0 ? parts.join(' · ') : null;
}

/** Query of GET /api/uploads: one workspace's uploads, a page at a time. */
export const uploadListQuerySchema = z.object({
  workspace: idSchema,
  limit: z.coerce.number().int().min(1).max(100).default(20),
  offset: z.coerce.number().int().min(0).default(0),
});
export type UploadListQuery = z.infer<typeof uploadListQuerySchema>;

/** One earlier upload of a workspace, as pickers list it. */
export const uploadListItemSchema = z.object({
  id: idSchema,
  fileName: z.string(),
  size: z.number().int().nonnegative(),
  format: recordingFormatSchema,
  /** Null when the file does not say (most CSV) or cannot be read. */
  device: recordingDeviceSchema.nullable(),
  /** First sample's time; null when the file has no absolute time. */
  startedAt: isoDateSchema.nullable(),
  /** When this workspace uploaded it (the same bytes may be shared with another workspace). */
  uploadedAt: isoDateSchema,
  /** Null when the uploader's account was deleted. */
  uploadedBy: z.object({ id: idSchema, name: z.string() }).nullable(),
});
export type UploadListItem = z.infer<typeof uploadListItemSchema>;

/**
 * GET /api/uploads?workspace=<id>&limit=&offset=: newest upload first. Needs read access
 * to the workspace (any member); anyone else gets 404.
 */
export const uploadListResponseSchema = z.object({
  uploads: z.array(uploadListItemSchema),
  total: z.number().int().nonnegative(),
  offset: z.number().int().nonnegative(),
  limit: z.number().int().positive(),
});
export type UploadListResponse = z.infer<typeof uploadListResponseSchema>;
