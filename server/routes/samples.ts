import { Router } from 'express';
import { sampleParamsSchema } from '../../shared/api/samples.js';
import { getSample, listSamples, sampleFiles } from '../services/samples.js';

/** The demo's sample recordings: public, for signed-out readers and new users alike. */
export function sampleRoutes(): Router {
  const router = Router();
  const all = sampleFiles();
  router.get('/', async (_req, res) => {
    res.setHeader('Cache-Control', 'public, max-age=3600');
    res.json(await listSamples(all));
  });
  router.get('/:name', async (req, res) => {
    const { name } = sampleParamsSchema.parse(req.params);
    const { sample, bytes, contentType } = await getSample(all, name);
    res.setHeader('Content-Type', contentType);
    res.setHeader('Content-Length', String(bytes.byteLength));
    // Plain ASCII name for old clients, the exact name for the rest (RFC 6266).
    const ascii = sample.name.replace(/[^\x20-\x7e]|["\\]/g, '_');
    res.setHeader('Content-Disposition', `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(sample.name)}`);
    res.setHeader('Cache-Control', 'public, max-age=3600');
    res.send(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
  });
  return router;
}
