import { Router } from 'express';
import type { AppContext } from '../context.js';
import { requireSession, userIdOf } from '../middleware/session.js';
import { checkHealth, getMe } from '../services/me.js';

export function healthRoutes(ctx: AppContext): Router {
  const router = Router();
  router.get('/health', async (_req, res) => {
    res.json(await checkHealth(ctx.database, ctx.version));
  });
  router.get('/me', requireSession(ctx.auth), async (_req, res) => {
    res.json(await getMe(ctx.database, userIdOf(res)));
  });
  return router;
}
