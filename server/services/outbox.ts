import type { MailMessage, MailSummary } from '../../shared/api/outbox.js';
import type { Db } from '../db/client.js';
import * as mail from '../db/repositories/mail.js';
import { listMemberships } from '../db/repositories/workspaces.js';
import { notFound } from '../errors.js';
import { assertOutboxReader } from './policy.js';

export async function listOutbox(db: Db, userId: string): Promise<MailSummary[]> {
  await assertAdmin(db, userId);
  return (await mail.listMailForAdmin(db, userId)).map((m) => ({ id: m.id, to: m.to, subject: m.subject, createdAt: m.createdAt.toISOString() }));
}

/** One message, if it is addressed to someone the caller administers. */
export async function getOutboxMessage(db: Db, userId: string, id: string): Promise<MailMessage> {
  await assertAdmin(db, userId);
  const m = await mail.findMailForAdmin(db, userId, id);
  if (!m) throw notFound('Message');
  return { id: m.id, to: m.to, from: m.from, subject: m.subject, text: m.text, html: m.html, createdAt: m.createdAt.toISOString() };
}

export async function storeCaughtMail(db: Db, m: { to: string; from: string; subject: string; text: string; html: string | null }): Promise<void> {
  await mail.insertMail(db, m);
}

async function assertAdmin(db: Db, userId: string): Promise<void> {
  assertOutboxReader((await listMemberships(db, userId)).some((m) => m.role === 'admin'));
}
