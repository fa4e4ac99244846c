import { createAuthClient } from 'better-auth/vue';
import { ApiError } from './http';

/**
 * better-auth's client for the account routes under /api/auth (same origin, so no
 * base URL). Everything else in the app goes through ./http.ts.
 */
export const authClient = createAuthClient({ basePath: '/api/auth' });

interface AuthResult {
  error: { message?: string | undefined; status: number; code?: string | undefined; statusText?: string } | null;
}

/** better-auth answers `{ data, error }`; the app wants the same ApiError as everywhere else. */
function unwrap(result: AuthResult, fallback: string): void {
  if (!result.error) return;
  const { status, code, message, statusText } = result.error;
  const text = message || statusText || fallback;
  throw new ApiError(code ? code.toLowerCase() : 'auth_failed', text, status);
}

/** Whether the browser holds a live session cookie; answers false rather than failing with 401. */
export async function hasSession(): Promise<boolean> {
  const result = await authClient.getSession();
  unwrap(result, 'Could not check the session.');
  return Boolean(result.data?.session);
}

export async function signInWithEmail(email: string, password: string): Promise<void> {
  unwrap(await authClient.signIn.email({ email, password }), 'Sign-in failed.');
}

export async function signUpWithEmail(name: string, email: string, password: string): Promise<void> {
  unwrap(await authClient.signUp.email({ name, email, password }), 'Could not create the account.');
}

export async function signOutOfSession(): Promise<void> {
  unwrap(await authClient.signOut(), 'Sign-out failed.');
}

/** Asks for a reset mail; `redirectTo` is where the mailed link lands with `?token=`. */
export async function requestPasswordReset(email: string, redirectTo: string): Promise<void> {
  unwrap(await authClient.requestPasswordReset({ email, redirectTo }), 'Could not send the reset mail.');
}

export async function resetPassword(token: string, newPassword: string): Promise<void> {
  unwrap(await authClient.resetPassword({ token, newPassword }), 'Could not set the new password.');
}
