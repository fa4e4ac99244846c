import { Router } from 'express';
import multer from 'multer';
import { idParamsSchema } from '../../shared/api/common.js';
import { exportQuerySchema, importFieldsSchema, importJsonBodySchema } from '../../shared/api/exports.js';
import { forkBodySchema } from '../../shared/api/forks.js';
import type { AppContext } from '../context.js';
import { requireSession, userIdOf } from '../middleware/session.js';
import * as exports from '../services/exports.js';
import { forkNotebook } from '../services/forks.js';

/** Files out and in (/api/notebooks/:id/export, /api/notebooks/import) and forking a notebook. */
export function exportRoutes(ctx: AppContext): Router {
  const router = Router();
  const db = ctx.database.db;
  const signedIn = requireSession(ctx.auth);
  // Embedded recordings are base64 (4/3 of their size): allow that much over the upload limit, for a few of them.
  const receive = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: Math.ceil(ctx.config.uploadLimitMb * 1024 * 1024 * 4), files: 1, fields: 5 },
  }).single('file');

  router.get('/notebooks/:id/export', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    const { recordings } = exportQuerySchema.parse(req.query);
    const { fileName, file, omitted } = await exports.exportNotebook(db, userIdOf(res), id, recordings);
    res.setHeader('Content-Disposition', `attachment; filename*=UTF-8''${encodeURIComponent(fileName)}`);
    res.setHeader('X-Cogbook-Recordings-Omitted', String(omitted));
    res.json(file);
  });
  router.post('/notebooks/import', signedIn, receive, async (req, res) => {
    let workspaceId: string;
    let input: unknown;
    if (req.file) {
      workspaceId = importFieldsSchema.parse(req.body ?? {}).workspaceId;
      input = exports.parseExportText(req.file.buffer.toString('utf8'));
    } else {
      const body = importJsonBodySchema.parse(req.body ?? {});
      workspaceId = body.workspaceId;
      input = body.file;
    }
    res.status(201).json(await exports.importNotebook(db, userIdOf(res), workspaceId, input));
  });
  router.post('/notebooks/:id/fork', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.status(201).json(await forkNotebook(db, userIdOf(res), id, forkBodySchema.parse(req.body)));
  });
  return router;
}
