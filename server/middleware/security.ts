import type { RequestHandler } from 'express';
import helmet from 'helmet';

/**
 * The page's policy. No 'unsafe-eval' for scripts; 'unsafe-inline' styles because
 * ant-design-vue injects style tags at run time.
 */
export function securityHeaders(): RequestHandler {
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'"],
        styleSrc: ["'self'", "'unsafe-inline'"],
        imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'", 'data:'],
        workerSrc: ["'self'", 'blob:'],
        connectSrc: ["'self'"],
        objectSrc: ["'none'"],
        frameAncestors: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
      },
    },
    crossOriginEmbedderPolicy: false,
  });
}

/**
 * The engine worker's own script policy. arquero compiles table expressions with
 * Function(), which needs 'unsafe-eval' inside that worker only; the page keeps the
 * strict policy above.
 */
export const ENGINE_WORKER_CSP =
  "default-src 'self'; script-src 'self' 'unsafe-eval'; worker-src 'self' blob:; connect-src 'self'; img-src 'self' data: blob:; object-src 'none'";

/** Built engine worker files: /assets/engine.worker-<hash>.js (and its map). */
export function isEngineWorkerAsset(fileName: string): boolean {
  return /^engine\.worker/.test(fileName);
}

/**
 * Refuses state-changing API calls whose Origin header names another site. Cookies
 * are SameSite=Lax already; this also covers old browsers and same-site subdomains.
 * Requests without Origin (curl, server-to-server) pass unless Sec-Fetch-Site names
 * another site: they carry no ambient cookie from a browser visit.
 */
export function originGuard(trustedOrigins: string[]): RequestHandler {
  const trusted = new Set(trustedOrigins);
  return (req, res, next) => {
    if (req.method === 'GET' || req.method === 'HEAD' || req.method === 'OPTIONS') return next();
    const origin = req.headers.origin;
    if (origin !== undefined && trusted.has(origin)) return next();
    // Without Origin, a browser still says where the request came from in Sec-Fetch-Site (a page cannot forge it).
    const site = req.headers['sec-fetch-site'];
    if (origin === undefined && (site === undefined || site === 'same-origin' || site === 'none')) return next();
    const from = origin ?? `a ${String(site)} page`;
    res.status(403).json({ error: { code: 'forbidden_origin', message: `Requests from ${from} are not accepted.` } });
  };
}
