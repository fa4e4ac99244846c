import { desc, eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../client.js';
import { mailMessage, user, workspaceMember } from '../schema.js';

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
 * included), newest first. Addresses are compared lower-cased.
 */
export async function listMailForAdmin(db: Db, adminUserId: string, limit = 200): Promise<MailRecord[]> {
  const adminOf = db
    .select({ workspaceId: workspaceMember.workspaceId })
    .from(workspaceMember)
    .where(sql`${workspaceMember.userId} = ${adminUserId} and ${workspaceMember.role} = 'admin'`);
  const emails = db
    .select({ email: user.email })
    .from(user)
    .innerJoin(workspaceMember, eq(workspaceMember.userId, user.id))
    .where(inArray(workspaceMember.workspaceId, adminOf));
  return db
    .select()
    .from(mailMessage)
    .where(inArray(sql`lower(${mailMessage.to})`, emails))
    .orderBy(desc(mailMessage.createdAt))
    .limit(limit);
}

export async function findMail(db: Db, id: string): Promise<MailRecord | undefined> {
  const rows = await db.select().from(mailMessage).where(eq(mailMessage.id, id));
  return rows[0];
}
