import { pipeline } from 'node:stream/promises';
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { idParamsSchema } from '../../shared/api/common.js';
import { uploadFieldsSchema, uploadListQuerySchema } from '../../shared/api/uploads.js';
import type { AppContext } from '../context.js';
import { AppError } from '../errors.js';
import { userIdOf } from '../middleware/session.js';
import * as uploads from '../services/uploads.js';

const MAX_FILES_PER_REQUEST = 20;

export function uploadRoutes(ctx: AppContext): Router {
  const router = Router();
  const db = ctx.database.db;
  // Memory storage: the bytes go to the database anyway, and the size limit bounds memory.
  const receive = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: Math.floor(ctx.config.uploadLimitMb * 1024 * 1024), files: MAX_FILES_PER_REQUEST, fields: 10 },
  }).array('file', MAX_FILES_PER_REQUEST);
  // Other errors of the multipart parser (busboy's "Unexpected end of form", "Malformed part header") are the body's fault.
  const parseMultipart: RequestHandler = (req, res, next) =>
    receive(req, res, (err?: unknown) => {
      if (err && !(err instanceof multer.MulterError)) {
        return next(new AppError(400, 'bad_upload', `Upload refused: the multipart body is malformed (${err instanceof Error ? err.message : String(err)}).`));
      }
      next(err);
    });

  router.post('/', parseMultipart, async (req, res) => {
    const { workspaceId, readDamaged } = uploadFieldsSchema.parse(req.body ?? {});
    const files = ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({
      // multer decodes the part's filename as latin1; browsers send UTF-8.
      fileName: Buffer.from(f.originalname, 'latin1').toString('utf8'),
      bytes: new Uint8Array(f.buffer.buffer, f.buffer.byteOffset, f.buffer.byteLength),
    }));
    res.status(201).json(await uploads.storeUploads(db, userIdOf(res), workspaceId, files, { readDamaged: readDamaged === 'true' }));
  });
  router.get('/', async (req, res) => {
    res.json(await uploads.listUploads(db, userIdOf(res), uploadListQuerySchema.parse(req.query)));
  });
  router.get('/:id', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await uploads.getUploadMeta(db, userIdOf(res), id));
  });
  router.get('/:id/content', async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    const { meta, stream } = await uploads.openUploadContent(db, userIdOf(res), id);
    res.setHeader('Content-Type', 'application/octet-stream');
    res.setHeader('Content-Length', String(meta.size));
    res.setHeader('Content-Disposition', `attachment; filename*=UTF-8''${encodeURIComponent(meta.fileName)}`);
    res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
    await pipeline(stream, res);
  });
  return router;
}
