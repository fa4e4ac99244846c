import { z } from 'zod';
import { idSchema } from './common.js';
import { workspaceSummarySchema } from './workspaces.js';

/** GET /api/me: the signed-in user and the workspaces they belong to. */
export const meResponseSchema = z.object({
  user: z.object({
    id: idSchema,
    name: z.string(),
    email: z.string(),
    emailVerified: z.boolean(),
  }),
  workspaces: z.array(workspaceSummarySchema),
});
export type MeResponse = z.infer<typeof meResponseSchema>;

/** GET /api/health */
export const healthResponseSchema = z.object({
  status: z.literal('ok'),
  database: z.enum(['pglite', 'postgres']),
  version: z.string(),
});
export type HealthResponse = z.infer<typeof healthResponseSchema>;
