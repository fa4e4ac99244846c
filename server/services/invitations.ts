import { createHash, randomBytes } from 'node:crypto';
import type {
  AcceptInvitationResponse,
  CreateInvitationBody,
  InvitationPreview,
  PendingInvitation,
} from '../../shared/api/invitations.js';
import type { WorkspaceRole } from '../../shared/api/workspaces.js';
import type { Db } from '../db/client.js';
import * as repo from '../db/repositories/invitations.js';
import { findUserByEmail, findUserById } from '../db/repositories/users.js';
import { findMember, findRole, findWorkspace } from '../db/repositories/workspaces.js';
import { AppError, notFound, unauthenticated } from '../errors.js';
import type { Mailer } from '../mail/mailer.js';
import { assertWorkspace } from './policy.js';

/** How long an invitation link works. */
export const INVITATION_TTL_MS = 7 * 24 * 60 * 60 * 1000;

/** What sending an invitation needs besides the database. */
export interface InvitationMail {
  mailer: Mailer;
  /** The public origin the accept link points at (BASE_URL). */
  baseUrl: string;
}

const ROLE_WORDS: Record<WorkspaceRole, string> = {
  admin: 'an admin (manages members and every notebook)',
  analyst: 'an analyst (creates and edits notebooks, uploads rides)',
  viewer: 'a viewer (reads notebooks and results)',
};

const gone = () =>
  new AppError(404, 'not_found', 'This invitation link is unknown, expired, revoked or already used. Ask a workspace admin for a new one.');

/** Only the hash is stored: a leaked database row does not open the workspace. */
export function hashInvitationToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/**
 * Invites an address (account or not) into a workspace and mails the accept link.
 * If the mail cannot be handed over, the invitation is withdrawn again so the list
 * never shows one nobody received.
 */
export async function createInvitation(
  db: Db,
  mail: InvitationMail,
  userId: string,
  workspaceId: string,
  body: CreateInvitationBody,
  now = new Date(),
): Promise<PendingInvitation> {
  assertWorkspace(await findRole(db, workspaceId, userId), 'manage-members');
  const email = body.email.trim().toLowerCase();
  const existing = await findUserByEmail(db, email);
  if (existing && (await findMember(db, workspaceId, existing.id))) {
    throw new AppError(409, 'already_member', `${email} is already a member of this workspace.`);
  }
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(now.getTime() + INVITATION_TTL_MS);
  const id = await repo.replaceInvitation(db, { workspaceId, email, role: body.role, tokenHash: hashInvitationToken(token), invitedBy: userId, expiresAt });
  const invitation = (await repo.findOpenById(db, workspaceId, id, now))!;
  try {
    await mail.mailer.send(invitationMail(invitation, `${mail.baseUrl}/invitations/${token}`));
  } catch (error) {
    await repo.deleteInvitation(db, id);
    throw new AppError(502, 'mail_failed', `The invitation mail to ${email} could not be sent (${error instanceof Error ? error.message : String(error)}). Nothing was stored; try again later.`);
  }
  return toPending(invitation);
}

export async function listInvitations(db: Db, userId: string, workspaceId: string, now = new Date()): Promise<PendingInvitation[]> {
  assertWorkspace(await findRole(db, workspaceId, userId), 'manage-members');
  return (await repo.listOpen(db, workspaceId, now)).map(toPending);
}

/** Revokes an open invitation; its link answers 404 from then on. */
export async function revokeInvitation(db: Db, userId: string, workspaceId: string, invitationId: string, now = new Date()): Promise<void> {
  assertWorkspace(await findRole(db, workspaceId, userId), 'manage-members');
  if (!(await repo.findOpenById(db, workspaceId, invitationId, now))) throw notFound('Invitation');
  await repo.deleteInvitation(db, invitationId);
}

/** What an open link offers; anyone holding the token may look. */
export async function previewInvitation(db: Db, token: string, now = new Date()): Promise<InvitationPreview> {
  const invitation = await repo.findOpenByTokenHash(db, hashInvitationToken(token), now);
  if (!invitation) throw gone();
  return {
    workspaceName: invitation.workspaceName,
    inviterName: invitation.inviterName,
    role: invitation.role,
    email: invitation.email,
    expiresAt: invitation.expiresAt.toISOString(),
  };
}

/**
 * Joins the caller to the workspace. The signed-in account must use the invited
 * address: the token alone travels in a mail that may be forwarded.
 */
export async function acceptInvitation(db: Db, userId: string, token: string, now = new Date()): Promise<AcceptInvitationResponse> {
  const invitation = await repo.findOpenByTokenHash(db, hashInvitationToken(token), now);
  if (!invitation) throw gone();
  const account = await findUserById(db, userId);
  if (!account) throw unauthenticated();
  if (account.email.toLowerCase() !== invitation.email) {
    throw new AppError(
      403,
      'email_mismatch',
      `This invitation is for ${invitation.email}, but you are signed in as ${account.email}. Sign out, then sign in or sign up as ${invitation.email} to accept it.`,
    );
  }
  const joined = await repo.acceptInvitation(db, invitation.id, userId, now);
  if (!joined) throw gone();
  const ws = await findWorkspace(db, joined.workspaceId);
  return { workspaceId: joined.workspaceId, workspaceName: ws?.name ?? invitation.workspaceName, role: joined.role };
}

function invitationMail(invitation: repo.InvitationRecord, url: string) {
  const who = invitation.inviterName ?? 'A workspace admin';
  const until = invitation.expiresAt.toISOString().slice(0, 10);
  return {
    to: invitation.email,
    subject: `${who} invited you to ${invitation.workspaceName} on Cogbook`,
    text:
      `Hello,\n\n${who} invited you to join the workspace "${invitation.workspaceName}" on Cogbook as ${ROLE_WORDS[invitation.role]}.\n\n` +
      `To accept, open this link (it works until ${until}, once):\n\n${url}\n\n` +
      `No Cogbook account yet? The link lets you sign up with ${invitation.email}, then joins you to the workspace.\n` +
      `If you did not expect this, ignore this mail.\n`,
  };
}

function toPending(r: repo.InvitationRecord): PendingInvitation {
  return {
    id: r.id,
    email: r.email,
    role: r.role,
    invitedBy: r.invitedBy ? { id: r.invitedBy, name: r.inviterName ?? '' } : null,
    createdAt: r.createdAt.toISOString(),
    expiresAt: r.expiresAt.toISOString(),
  };
}
