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

/** Sets res.locals.userId when a valid session comes with the request; lets everyone through. */
export function optionalSession(auth: Auth): RequestHandler {
  return async (req, res, next) => {
    const session = await auth.api.getSession({ headers: fromNodeHeaders(req.headers) });
    if (session) res.locals.userId = session.user.id;
    next();
  };
}

/** The signed-in user's id, or null (after {@link optionalSession}). */
export function optionalUserIdOf(res: Response): string | null {
  const id: unknown = res.locals.userId;
  return typeof id === 'string' ? id : null;
}
