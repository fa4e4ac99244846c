import { Router } from 'express';
import { idParamsSchema } from '../../shared/api/common.js';
import { createRunBodySchema, runCellParamsSchema, runCompareQuerySchema } from '../../shared/api/runs.js';
import type { AppContext } from '../context.js';
import { requireSession, userIdOf } from '../middleware/session.js';
import * as runs from '../services/runs.js';

/** Recipe runs: /api/notebooks/:id/runs, /api/runs/:id. */
export function runRoutes(ctx: AppContext): Router {
  const router = Router();
  const db = ctx.database.db;
  const signedIn = requireSession(ctx.auth);
  router.post('/notebooks/:id/runs', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.status(201).json(await runs.createRun(db, userIdOf(res), id, createRunBodySchema.parse(req.body ?? {})));
  });
  router.get('/notebooks/:id/runs', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json({ runs: await runs.listRuns(db, userIdOf(res), id) });
  });
  router.get('/notebooks/:id/runs/compare', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    const { path } = runCompareQuerySchema.parse(req.query);
    res.json(await runs.compareRuns(db, userIdOf(res), id, path));
  });
  router.get('/runs/:id', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await runs.getRun(db, userIdOf(res), id));
  });
  router.get('/runs/:id/cells/:cellId.csv', signedIn, async (req, res) => {
    const { id, cellId } = runCellParamsSchema.parse(req.params);
    const { fileName, csv } = await runs.runCellCsv(db, userIdOf(res), id, cellId);
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename*=UTF-8''${encodeURIComponent(fileName)}`);
    res.send(csv);
  });
  return router;
}
