import { ApiError } from '@/api/http';

/** A sentence for people out of whatever was thrown. */
export function errorMessage(error: unknown, fallback: string): string {
  if (error instanceof ApiError) {
    if (error.code === 'invalid_email_or_password') return 'That e-mail and password do not match an account.';
    if (error.code === 'rate_limited' || error.status === 429) return 'Too many attempts. Wait a minute and try again.';
    return error.message || fallback;
  }
  if (error instanceof Error && error.message) return error.message;
  return fallback;
}
