import { Router } from 'express';
import { idParamsSchema } from '../../shared/api/common.js';
import {
  createNotebookBodySchema,
  notebookListQuerySchema,
  putNotebookAccessBodySchema,
  restoreRevisionBodySchema,
  revisionParamsSchema,
  saveNotebookBodySchema,
} from '../../shared/api/notebooks.js';
import type { AppContext } from '../context.js';
import { userIdOf } from '../middleware/session.js';
import * as notebooks from '../services/notebooks.js';

export function notebookRoutes(ctx: AppContext): Router {
  const router = Router();
  const db = ctx.database.db;
  router.get('/', async (req, res) => {
    const { workspaceId } = notebookListQuerySchema.parse(req.query);
    res.json({ notebooks: await notebooks.listNotebooks(db, userIdOf(res), workspaceId) });
  });
  router.post('/', async (req, res) => {
    res.status(201).json(await notebooks.createNotebook(db, userIdOf(res), createNotebookBodySchema.parse(req.body)));
  });
  router.get('/:id', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await notebooks.getNotebook(db, userIdOf(res), id));
  });
  router.put('/:id', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await notebooks.saveNotebook(db, userIdOf(res), id, saveNotebookBodySchema.parse(req.body)));
  });
  router.delete('/:id', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    await notebooks.deleteNotebook(db, userIdOf(res), id);
    res.status(204).end();
  });
  router.get('/:id/revisions', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json({ revisions: await notebooks.listRevisions(db, userIdOf(res), id) });
  });
  router.get('/:id/revisions/:rev', async (req, res) => {
    const { id, rev } = revisionParamsSchema.parse(req.params);
    res.json(await notebooks.getRevision(db, userIdOf(res), id, rev));
  });
  router.post('/:id/revisions/:rev/restore', async (req, res) => {
    const { id, rev } = revisionParamsSchema.parse(req.params);
    const { summary } = restoreRevisionBodySchema.parse(req.body);
    res.json(await notebooks.restoreRevision(db, userIdOf(res), id, rev, summary));
  });
  router.get('/:id/access', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await notebooks.getAccess(db, userIdOf(res), id));
  });
  router.put('/:id/access', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await notebooks.putAccess(db, userIdOf(res), id, putNotebookAccessBodySchema.parse(req.body)));
  });
  return router;
}
