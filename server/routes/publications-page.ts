import { readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { Router } from 'express';
import { publicationSlugParamsSchema } from '../../shared/api/publications.js';

/**
 * The published page for signed-out readers: the client build's published.html (an entry of
 * its own, without the editor's code), with a preload link that starts the page's one API
 * request, `GET /api/published/:slug`, while the browser is still reading the HTML, in
 * parallel with the scripts. Without a built published.html the app's own page serves these
 * addresses (its router has the same route).
 */
export function publishedPageRoutes(clientDir: string): Router {
  const router = Router();
  const file = join(clientDir, 'published.html');
  let cached: { mtimeMs: number; html: string } | undefined;
  const template = (): string | undefined => {
    let mtimeMs: number;
    try {
      mtimeMs = statSync(file).mtimeMs;
    } catch {
      return undefined;
    }
    // Read again after a new build, as the app's own page is.
    if (cached?.mtimeMs !== mtimeMs) cached = { mtimeMs, html: readFileSync(file, 'utf8') };
    return cached.html;
  };
  router.get(['/p/:slug', '/published/:slug'], (req, res, next) => {
    const html = template();
    if (html === undefined) return next();
    const parsed = publicationSlugParamsSchema.safeParse(req.params);
    // The same request the page's script makes (fetch: CORS mode, same-origin credentials), so the browser hands it the preloaded answer.
    const preload = parsed.success ? `<link rel="preload" href="/api/published/${encodeURIComponent(parsed.data.slug)}" as="fetch" crossorigin="anonymous">` : '';
    res.setHeader('Cache-Control', 'no-cache');
    res.type('html').send(preload ? html.replace('</head>', `    ${preload}\n  </head>`) : html);
  });
  return router;
}
