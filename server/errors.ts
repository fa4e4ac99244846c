/**
 * The server's one application error: an HTTP status, a stable code, a message for
 * people, and optional details. The error middleware turns it into
 * `{ error: { code, message, details? } }`.
 */
export class AppError extends Error {
  override readonly name = 'AppError';
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export const notFound = (what: string) => new AppError(404, 'not_found', `${what} was not found.`);
export const forbidden = (message: string) => new AppError(403, 'forbidden', message);
export const unauthenticated = () => new AppError(401, 'unauthenticated', 'Sign in to continue.');
