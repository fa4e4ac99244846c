import { desc, eq } from 'drizzle-orm';
import type { Db } from '../client.js';
import { shareLink, user } from '../schema.js';

export interface ShareRecord {
  token: string;
  notebookId: string;
  membersOnly: boolean;
  createdBy: string | null;
  createdByName: string | null;
  createdAt: Date;
}

const columns = {
  token: shareLink.token,
  notebookId: shareLink.notebookId,
  membersOnly: shareLink.membersOnly,
  createdBy: shareLink.createdBy,
  createdByName: user.name,
  createdAt: shareLink.createdAt,
};

export async function insertShare(db: Db, input: { token: string; notebookId: string; membersOnly: boolean; createdBy: string }): Promise<void> {
  await db.insert(shareLink).values(input);
}

export async function findShare(db: Db, token: string): Promise<ShareRecord | undefined> {
  const rows = await db.select(columns).from(shareLink).leftJoin(user, eq(user.id, shareLink.createdBy)).where(eq(shareLink.token, token));
  return rows[0];
}

export async function listShares(db: Db, notebookId: string): Promise<ShareRecord[]> {
  return db
    .select(columns)
    .from(shareLink)
    .leftJoin(user, eq(user.id, shareLink.createdBy))
    .where(eq(shareLink.notebookId, notebookId))
    .orderBy(desc(shareLink.createdAt));
}

/** Revokes a link: the row goes, so the token stops working everywhere at once. */
export async function deleteShare(db: Db, token: string): Promise<void> {
  await db.delete(shareLink).where(eq(shareLink.token, token));
}
