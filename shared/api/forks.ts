import { z } from 'zod';
import { idSchema } from './common.js';

/**
 * POST /api/notebooks/:id/fork (anyone who can read it) and POST /api/shared/:token/fork
 * (signed in, with a live share token): copies the current revision into a new notebook
 * in `workspaceId`, where the caller must be admin or analyst. The copy binds the same
 * stored uploads; `notebook.forkedFrom` names the origin and revision. The original is
 * not changed. Answers 201 with a NotebookResponse.
 */
export const forkBodySchema = z.object({
  workspaceId: idSchema,
  /** Default: the original title followed by " (copy)". */
  title: z.string().trim().min(1).max(200).optional(),
});
export type ForkBody = z.infer<typeof forkBodySchema>;
