import { z } from 'zod';

/** Ids are opaque strings (UUIDs for app rows, better-auth's ids for users). */
export const idSchema = z.string().min(1).max(64);

/** Route params of the form `/:id`. */
export const idParamsSchema = z.object({ id: idSchema });

/** Timestamps cross the wire as ISO 8601 strings. */
export const isoDateSchema = z.string();

/** A user as other members see them. */
export const userRefSchema = z.object({
  id: idSchema,
  name: z.string(),
  email: z.string(),
});

export type UserRef = z.infer<typeof userRefSchema>;
