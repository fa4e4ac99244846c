import { Router } from 'express';
import { idParamsSchema } from '../../shared/api/common.js';
import { publicationSlugParamsSchema, publishBodySchema, publishedFileParamsSchema } from '../../shared/api/publications.js';
import type { AppContext } from '../context.js';
import { requireSession, userIdOf } from '../middleware/session.js';
import { bodyFor, publishedPagesOf } from '../services/published-pages.js';
import * as publications from '../services/publications.js';

export interface PublicationRouteOptions {
  /** Told each slug just published (or republished), after the answer has gone out. */
  onPublished?: (slug: string) => void;
}

/** Publishing (editors) and the public reader's routes under /api/published. */
export function publicationRoutes(ctx: AppContext, options: PublicationRouteOptions = {}): Router {
  const router = Router();
  const db = ctx.database.db;
  const signedIn = requireSession(ctx.auth);
  const baseUrl = ctx.config.baseUrl;
  const pages = publishedPagesOf(ctx.database);
  router.post('/notebooks/:id/publication', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    const published = await publications.publish(db, userIdOf(res), id, publishBodySchema.parse(req.body ?? {}), baseUrl);
    res.json(published);
    options.onPublished?.(published.slug);
  });
  router.get('/notebooks/:id/publication', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    res.json(await publications.getPublication(db, userIdOf(res), id, baseUrl));
  });
  router.delete('/notebooks/:id/publication', signedIn, async (req, res) => {
    const { id } = idParamsSchema.parse(req.params);
    await publications.unpublish(db, userIdOf(res), id);
    res.status(204).end();
  });
  router.get('/published', async (_req, res) => {
    res.json(await publications.listPublished(db));
  });
  router.get('/published/:slug', async (req, res) => {
    const { slug } = publicationSlugParamsSchema.parse(req.params);
    const page = await pages.read(db, slug);
    // Anyone may keep a copy, but must ask again before each use: an unpublished page is
    // gone at once, and an unchanged one costs a 304 without the snapshot.
    res.setHeader('Cache-Control', 'public, no-cache');
    res.setHeader('ETag', page.etag);
    res.vary('Accept-Encoding');
    if (req.fresh) {
      res.status(304).end();
      return;
    }
    const { body, encoding } = bodyFor(page, (coding) => req.acceptsEncodings(coding) === coding);
    if (encoding) res.setHeader('Content-Encoding', encoding);
    res.type('json').send(body);
  });
  router.get('/published/:slug/files/:uploadId', async (req, res) => {
    const { slug, uploadId } = publishedFileParamsSchema.parse(req.params);
    const { fileName, bytes } = await publications.readPublishedFile(db, slug, uploadId);
    res.setHeader('Content-Type', 'application/octet-stream');
    res.setHeader('Content-Disposition', `attachment; filename*=UTF-8''${encodeURIComponent(fileName)}`);
    res.send(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  });
  return router;
}
