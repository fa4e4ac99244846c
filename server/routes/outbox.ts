import { Router } from 'express';
import { idParamsSchema } from '../../shared/api/common.js';
import type { AppContext } from '../context.js';
import { userIdOf } from '../middleware/session.js';
import * as outbox from '../services/outbox.js';

export function outboxRoutes(ctx: AppContext): Router {
  const router = Router();
  const db = ctx.database.db;
  router.get('/', async (_req, res) => {
    res.json({ messages: await outbox.listOutbox(db, userIdOf(res)) });
  });
  router.get('/:id', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await outbox.getOutboxMessage(db, userIdOf(res), id));
  });
  return router;
}
