import { and, desc, eq, like } from 'drizzle-orm';
import { mailMessage } from '../../../server/db/schema.js';
import type { Agent, TestApp } from './test-app.js';

/** Polls the outbox table for the newest invitation mail to `email` and returns the token of its link. */
export async function invitationTokenFor(t: TestApp, email: string): Promise<{ token: string; url: string; subject: string; text: string }> {
  for (let i = 0; i < 100; i++) {
    const rows = await t.database.db
      .select()
      .from(mailMessage)
      .where(and(eq(mailMessage.to, email), like(mailMessage.subject, '%invited you%')))
      .orderBy(desc(mailMessage.createdAt));
    const m = rows[0] && /(https?:\/\/\S+\/invitations\/([A-Za-z0-9_-]+))/.exec(rows[0].text);
    if (rows[0] && m) return { url: m[1]!, token: m[2]!, subject: rows[0].subject, text: rows[0].text };
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no invitation mail to ${email}`);
}

/** Invites `email` as `inviter` (expects 201) and returns the mailed token. Earlier mail to the address is ignored. */
export async function inviteAndReadToken(t: TestApp, inviter: Agent, workspaceId: string, email: string, role = 'analyst'): Promise<string> {
  await t.database.db.delete(mailMessage).where(eq(mailMessage.to, email));
  const res = await inviter.post(`/api/workspaces/${workspaceId}/invitations`).send({ email, role });
  if (res.status !== 201) throw new Error(`invitation of ${email} failed: ${res.status} ${res.text}`);
  return (await invitationTokenFor(t, email)).token;
}
