import { z } from 'zod';
import { idSchema, isoDateSchema } from './common.js';
import { workspaceRoleSchema } from './workspaces.js';

/** An invitation token as it travels in the accept link: 43 url-safe characters (32 random bytes). */
export const invitationTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{32,64}$/, 'not an invitation token');

/** Route params of `/api/invitations/:token` and `/api/invitations/:token/accept`. */
export const invitationTokenParamsSchema = z.object({ token: invitationTokenSchema });

/** Route params of `DELETE /api/workspaces/:id/invitations/:invitationId`. */
export const invitationParamsSchema = z.object({ id: idSchema, invitationId: idSchema });

/**
 * POST /api/workspaces/:id/invitations (workspace admins): e-mails `email` a link to
 * join the workspace with `role`. The address needs no account yet: the invitee signs
 * up with it and accepts. A second invitation to the same address replaces the first
 * (its link stops working). Answers 201 with a {@link PendingInvitation}; 409
 * `already_member` when an account with that address is already a member.
 */
export const createInvitationBodySchema = z.object({
  email: z.email().max(254),
  role: workspaceRoleSchema,
});
export type CreateInvitationBody = z.infer<typeof createInvitationBodySchema>;

/** An invitation not yet accepted, as the workspace's admins see it. The token is never shown again after the mail. */
export const pendingInvitationSchema = z.object({
  id: idSchema,
  email: z.string(),
  role: workspaceRoleSchema,
  invitedBy: z.object({ id: idSchema, name: z.string() }).nullable(),
  createdAt: isoDateSchema,
  expiresAt: isoDateSchema,
});
export type PendingInvitation = z.infer<typeof pendingInvitationSchema>;

/**
 * GET /api/workspaces/:id/invitations (workspace admins): unaccepted, unexpired
 * invitations, newest first. DELETE /api/workspaces/:id/invitations/:invitationId
 * revokes one (204); its link answers 404 from then on.
 */
export const invitationListResponseSchema = z.object({ invitations: z.array(pendingInvitationSchema) });
export type InvitationListResponse = z.infer<typeof invitationListResponseSchema>;

/**
 * GET /api/invitations/:token (no sign-in needed): what the link offers. Unknown,
 * revoked, expired and already accepted tokens all answer 404.
 */
export const invitationPreviewSchema = z.object({
  workspaceName: z.string(),
  inviterName: z.string().nullable(),
  role: workspaceRoleSchema,
  /** The address invited: the account that accepts must use it. */
  email: z.string(),
  expiresAt: isoDateSchema,
});
export type InvitationPreview = z.infer<typeof invitationPreviewSchema>;

/**
 * POST /api/invitations/:token/accept (signed in; the account's e-mail must be the
 * invited one, else 403 `email_mismatch`): adds the membership and uses up the link.
 * Answers 200; a caller who already was a member keeps their current role.
 */
export const acceptInvitationResponseSchema = z.object({
  workspaceId: idSchema,
  workspaceName: z.string(),
  role: workspaceRoleSchema,
});
export type AcceptInvitationResponse = z.infer<typeof acceptInvitationResponseSchema>;
