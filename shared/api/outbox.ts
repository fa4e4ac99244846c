import { z } from 'zod';
import { idSchema, isoDateSchema } from './common.js';

/** A mail captured by the built-in SMTP catcher (only when no SMTP_URL is configured). */
export const mailSummarySchema = z.object({
  id: idSchema,
  to: z.string(),
  subject: z.string(),
  createdAt: isoDateSchema,
});
export type MailSummary = z.infer<typeof mailSummarySchema>;

/** GET /api/outbox: newest first, mail to members of workspaces the caller administers. */
export const outboxListResponseSchema = z.object({ messages: z.array(mailSummarySchema) });
export type OutboxListResponse = z.infer<typeof outboxListResponseSchema>;

/** GET /api/outbox/:id */
export const mailMessageSchema = mailSummarySchema.extend({
  from: z.string(),
  text: z.string(),
  html: z.string().nullable(),
});
export type MailMessage = z.infer<typeof mailMessageSchema>;
