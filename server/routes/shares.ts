import { Router } from 'express';
import { idParamsSchema } from '../../shared/api/common.js';
import { forkBodySchema } from '../../shared/api/forks.js';
import { createShareBodySchema, shareTokenParamsSchema } from '../../shared/api/shares.js';
import type { AppContext } from '../context.js';
import { optionalSession, optionalUserIdOf, requireSession, userIdOf } from '../middleware/session.js';
import { forkShared } from '../services/forks.js';
import * as shares from '../services/shares.js';

/** Share links: made and revoked by editors, opened by anyone holding the token. */
export function shareRoutes(ctx: AppContext): Router {
  const router = Router();
  const db = ctx.database.db;
  const signedIn = requireSession(ctx.auth);
  const baseUrl = ctx.config.baseUrl;
  router.post('/notebooks/:id/shares', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.status(201).json(await shares.createShare(db, userIdOf(res), id, createShareBodySchema.parse(req.body ?? {}), baseUrl));
  });
  router.get('/notebooks/:id/shares', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json({ shares: await shares.listShares(db, userIdOf(res), id, baseUrl) });
  });
  router.delete('/shares/:token', signedIn, async (req, res) => {
    const { token } = shareTokenParamsSchema.parse(req.params);
    await shares.revokeShare(db, userIdOf(res), token);
    res.status(204).end();
  });
  router.get('/shared/:token', optionalSession(ctx.auth), async (req, res) => {
    const { token } = shareTokenParamsSchema.parse(req.params);
    res.setHeader('Cache-Control', 'no-store');
    res.setHeader('Referrer-Policy', 'no-referrer');
    res.json(await shares.readShared(db, optionalUserIdOf(res), token));
  });
  router.post('/shared/:token/fork', signedIn, async (req, res) => {
    const { token } = shareTokenParamsSchema.parse(req.params);
    res.status(201).json(await forkShared(db, userIdOf(res), token, forkBodySchema.parse(req.body)));
  });
  return router;
}
