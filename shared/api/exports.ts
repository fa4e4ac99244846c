import { z } from 'zod';
import { idSchema } from './common.js';
import { notebookResponseSchema } from './notebooks.js';

/**
 * GET /api/notebooks/:id/export?recordings=1 (readers): the notebook as a Cogbook
 * export file (shared/notebook/export-format.ts), sent as an attachment
 * `<title>.cogbook.json`. With `recordings=1` the bound recordings the caller may read
 * are embedded (base64); the header `X-Cogbook-Recordings-Omitted` counts any left out.
 */
export const exportQuerySchema = z.object({
  recordings: z
    .enum(['0', '1', 'true', 'false'])
    .optional()
    .transform((v) => v === '1' || v === 'true'),
});
export type ExportQuery = z.infer<typeof exportQuerySchema>;

/**
 * POST /api/notebooks/import (admins and analysts of `workspaceId`): multipart with a
 * text field `workspaceId` and the file in part `file`; or JSON `{ workspaceId, file }`
 * with the parsed export object (up to the 5 MB JSON limit). All or nothing: a damaged
 * file answers 400 `import_invalid` (a newer format: `import_too_new`) and stores nothing.
 */
export const importFieldsSchema = z.object({ workspaceId: idSchema });
export const importJsonBodySchema = z.object({ workspaceId: idSchema, file: z.unknown() });
export type ImportJsonBody = z.infer<typeof importJsonBodySchema>;

/** Answer of an import (201): the new notebook, and each embedded recording's upload. */
export const importResponseSchema = notebookResponseSchema.extend({
  imported: z.object({
    recordings: z.array(z.object({ slot: z.string(), uploadId: idSchema, fileName: z.string(), duplicate: z.boolean() })),
  }),
});
export type ImportResponse = z.infer<typeof importResponseSchema>;
