import { requestPasswordReset, resetPassword } from '@/api/auth';

/** The two halves of a password reset: ask for the mail, then set the password with its token. */
export function usePasswordReset() {
  return {
    /** The mailed link comes back to this app's reset page with `?token=`. */
    request: (email: string) => requestPasswordReset(email, `${window.location.origin}/reset-password`),
    reset: (token: string, newPassword: string) => resetPassword(token, newPassword),
  };
}
