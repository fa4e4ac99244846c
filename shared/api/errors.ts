import { z } from 'zod';

/**
 * The one error body every API route answers with on failure.
 * `code` is stable (tests and the client switch on it); `message` is for people;
 * `details` carries data such as field problems or the current revision.
 *
 * @example
 * { "error": { "code": "stale_revision", "message": "…", "details": { "currentRevision": 4 } } }
 */
export const apiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown().optional(),
  }),
});

export type ApiError = z.infer<typeof apiErrorSchema>;

/** One field problem inside a `validation_failed` error's `details.fields`. */
export const fieldIssueSchema = z.object({
  /** Dotted path of the field, e.g. `document.cells.3.name`; empty for the whole body. */
  path: z.string(),
  message: z.string(),
});

export type FieldIssue = z.infer<typeof fieldIssueSchema>;

/**
 * Error codes the API uses. Routes may add more; these are the ones the client
 * can rely on.
 */
export const API_ERROR_CODES = [
  'validation_failed', // 400, details.fields: FieldIssue[]
  'malformed_json', // 400
  'unauthenticated', // 401
  'forbidden', // 403
  'not_found', // 404
  'stale_revision', // 409, details: StaleRevisionDetails
  'conflict', // 409
  'payload_too_large', // 413, details.limitMb
  'unsupported_file', // 415/400 on uploads: content is neither FIT nor CSV
  'rate_limited', // 429
  'internal', // 500
] as const;

export type ApiErrorCode = (typeof API_ERROR_CODES)[number];
