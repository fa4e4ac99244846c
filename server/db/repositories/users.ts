import { eq, inArray, sql } from 'drizzle-orm';
import type { Db } from '../client.js';
import { user } from '../schema.js';

export interface UserRecord {
  id: string;
  name: string;
  email: string;
  emailVerified: boolean;
}

const columns = { id: user.id, name: user.name, email: user.email, emailVerified: user.emailVerified };

export async function findUserById(db: Db, id: string): Promise<UserRecord | undefined> {
  const rows = await db.select(columns).from(user).where(eq(user.id, id));
  return rows[0];
}

/** E-mail match ignores case, as better-auth stores e-mails lower-cased. */
export async function findUserByEmail(db: Db, email: string): Promise<UserRecord | undefined> {
  const rows = await db.select(columns).from(user).where(eq(user.email, email.toLowerCase()));
  return rows[0];
}

export async function findUsersByEmails(db: Db, emails: string[]): Promise<UserRecord[]> {
  if (emails.length === 0) return [];
  return db.select(columns).from(user).where(inArray(user.email, emails.map((e) => e.toLowerCase())));
}

export async function countUsers(db: Db): Promise<number> {
  const rows = await db.select({ n: sql<number>`count(*)::int` }).from(user);
  return rows[0]?.n ?? 0;
}

/** Round trip to the database, for the health check. */
export async function ping(db: Db): Promise<void> {
  await db.execute(sql`select 1`);
}
