import { z } from 'zod';
import { idSchema, isoDateSchema, userRefSchema } from './common.js';

/**
 * Role inside a workspace. `admin` manages members and every notebook; `analyst`
 * creates and edits notebooks; `viewer` reads. The full table is in
 * server/services/policy.ts.
 */
export const workspaceRoleSchema = z.enum(['admin', 'analyst', 'viewer']);
export type WorkspaceRole = z.infer<typeof workspaceRoleSchema>;

/** A workspace together with the caller's role in it. GET /api/workspaces items. */
export const workspaceSummarySchema = z.object({
  id: idSchema,
  name: z.string(),
  role: workspaceRoleSchema,
  /** True for the workspace created for the user at sign-up. */
  personal: z.boolean(),
  createdAt: isoDateSchema,
});
export type WorkspaceSummary = z.infer<typeof workspaceSummarySchema>;

/** GET /api/workspaces */
export const workspaceListResponseSchema = z.object({ workspaces: z.array(workspaceSummarySchema) });
export type WorkspaceListResponse = z.infer<typeof workspaceListResponseSchema>;

/** A member row. GET /api/workspaces/:id/members items. */
export const workspaceMemberSchema = z.object({
  user: userRefSchema,
  role: workspaceRoleSchema,
  addedAt: isoDateSchema,
});
export type WorkspaceMember = z.infer<typeof workspaceMemberSchema>;

/** GET /api/workspaces/:id/members */
export const memberListResponseSchema = z.object({ members: z.array(workspaceMemberSchema) });
export type MemberListResponse = z.infer<typeof memberListResponseSchema>;

/** POST /api/workspaces/:id/members: adds an existing account by e-mail. Answers 201 with a {@link WorkspaceMember}. */
export const addMemberBodySchema = z.object({
  email: z.email().max(254),
  role: workspaceRoleSchema,
});
export type AddMemberBody = z.infer<typeof addMemberBodySchema>;

/** PATCH /api/workspaces/:id/members/:userId: answers the updated {@link WorkspaceMember}. */
export const updateMemberBodySchema = z.object({ role: workspaceRoleSchema });
export type UpdateMemberBody = z.infer<typeof updateMemberBodySchema>;

/** Route params of `/api/workspaces/:id/members/:userId`. */
export const memberParamsSchema = z.object({ id: idSchema, userId: idSchema });
