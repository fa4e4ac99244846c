import { and, desc, eq, inArray, or, sql } from 'drizzle-orm';
import type { Db } from '../client.js';
import { mailMessage, user, workspaceInvitation, workspaceMember } from '../schema.js';

export interface MailRecord {
  id: string;
  to: string;
  from: string;
  subject: string;
  text: string;
  html: string | null;
  createdAt: Date;
}

export async function insertMail(db: Db, mail: Omit<MailRecord, 'id' | 'createdAt'>): Promise<string> {
  const [row] = await db.insert(mailMessage).values(mail).returning({ id: mailMessage.id });
  return row!.id;
}

/**
 * Mail addressed to members of the workspaces `adminUserId` administers (themselves
 * included) or to addresses invited into them, newest first. Addresses are compared lower-cased.
 */
export async function listMailForAdmin(db: Db, adminUserId: string, limit = 200): Promise<MailRecord[]> {
  return db
    .select()
    .from(mailMessage)
    .where(addressedToAdministered(db, adminUserId))
    .orderBy(desc(mailMessage.createdAt))
    .limit(limit);
}

/** One message, only if it is addressed to someone `adminUserId` administers. */
export async function findMailForAdmin(db: Db, adminUserId: string, id: string): Promise<MailRecord | undefined> {
  const rows = await db
    .select()
    .from(mailMessage)
    .where(and(eq(mailMessage.id, id), addressedToAdministered(db, adminUserId)));
  return rows[0];
}

/** To a member of, or an address invited into, a workspace the user administers. */
function addressedToAdministered(db: Db, adminUserId: string) {
  const to = sql`lower(${mailMessage.to})`;
  return or(inArray(to, administeredEmails(db, adminUserId)), inArray(to, invitedEmails(db, adminUserId)));
}

function adminWorkspaces(db: Db, adminUserId: string) {
  return db
    .select({ workspaceId: workspaceMember.workspaceId })
    .from(workspaceMember)
    .where(sql`${workspaceMember.userId} = ${adminUserId} and ${workspaceMember.role} = 'admin'`);
}

/** Addresses invited into the workspaces the user administers (stored lower-cased; a subquery). */
function invitedEmails(db: Db, adminUserId: string) {
  return db
    .select({ email: workspaceInvitation.email })
    .from(workspaceInvitation)
    .where(inArray(workspaceInvitation.workspaceId, adminWorkspaces(db, adminUserId)));
}

/** E-mails of every member of the workspaces the user administers (a subquery). */
function administeredEmails(db: Db, adminUserId: string) {
  const adminOf = adminWorkspaces(db, adminUserId);
  return db
    .select({ email: user.email })
    .from(user)
    .innerJoin(workspaceMember, eq(workspaceMember.userId, user.id))
    .where(inArray(workspaceMember.workspaceId, adminOf));
}
