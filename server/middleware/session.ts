import type { RequestHandler, Response } from 'express';
import { fromNodeHeaders } from 'better-auth/node';
import type { Auth } from '../auth.js';
import { unauthenticated } from '../errors.js';

/** Rejects with 401 unless a valid session cookie comes with the request. */
export function requireSession(auth: Auth): RequestHandler {
  return async (req, res, next) => {
    const session = await auth.api.getSession({ headers: fromNodeHeaders(req.headers) });
    if (!session) throw unauthenticated();
    res.locals.userId = session.user.id;
    next();
  };
}

/** The signed-in user's id (set by {@link requireSession}). */
export function userIdOf(res: Response): string {
  const id: unknown = res.locals.userId;
  if (typeof id !== 'string') throw unauthenticated();
  return id;
}
