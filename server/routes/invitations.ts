import { Router, type RequestHandler } from 'express';
import { invitationTokenParamsSchema } from '../../shared/api/invitations.js';
import type { AppContext } from '../context.js';
import { requireSession, userIdOf } from '../middleware/session.js';
import * as invitations from '../services/invitations.js';

/** Opening an invitation link: anyone with the token may look; accepting needs the invited account. */
export function invitationRoutes(ctx: AppContext): Router {
  const router = Router();
  const db = ctx.database.db;
  // The token is a credential: keep it out of caches and Referer headers.
  const noStore: RequestHandler = (_req, res, next) => {
    res.setHeader('Cache-Control', 'no-store');
    res.setHeader('Referrer-Policy', 'no-referrer');
    next();
  };
  router.get('/invitations/:token', noStore, async (req, res) => {
    const { token } = invitationTokenParamsSchema.parse(req.params);
    res.json(await invitations.previewInvitation(db, token));
  });
  router.post('/invitations/:token/accept', noStore, requireSession(ctx.auth), async (req, res) => {
    const { token } = invitationTokenParamsSchema.parse(req.params);
    res.json(await invitations.acceptInvitation(db, userIdOf(res), token));
  });
  return router;
}
