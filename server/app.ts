import { randomUUID } from 'node:crypto';
import { existsSync, readFileSync } from 'node:fs';
import { basename, join } from 'node:path';
import compression from 'compression';
import express, { type Express } from 'express';
import { rateLimit } from 'express-rate-limit';
import { pinoHttp } from 'pino-http';
import { toNodeHandler } from 'better-auth/node';
import { CLIENT_IP_HEADER, createAuth, type Auth } from './auth.js';
import type { AppContext, AppDeps } from './context.js';
import { configureComputeThreads } from './engine/run-in-worker.js';
import { errorHandler, notFoundHandler } from './middleware/error-handler.js';
import { ENGINE_WORKER_CSP, isEngineWorkerAsset, originGuard, securityHeaders } from './middleware/security.js';
import { requireSession } from './middleware/session.js';
import { exportRoutes } from './routes/exports.js';
import { healthRoutes } from './routes/health.js';
import { invitationRoutes } from './routes/invitations.js';
import { notebookRoutes } from './routes/notebooks.js';
import { outboxRoutes } from './routes/outbox.js';
import { currentPublication, publishedPageRoutes, readPublishedForPage, type PublishedPages } from './routes/publications-page.js';
import { publicationRoutes } from './routes/publications.js';
import { runRoutes } from './routes/runs.js';
import { sampleRoutes } from './routes/samples.js';
import { shareRoutes } from './routes/shares.js';
import { uploadRoutes } from './routes/uploads.js';
import { workspaceRoutes } from './routes/workspaces.js';
import { createPersonalWorkspace } from './services/workspaces.js';

/** Notebook documents are JSON; 5 MB holds hundreds of cells with notes. */
const JSON_LIMIT = '5mb';

export interface AppHandle {
  app: Express;
  auth: Auth;
}

/**
 * Builds the HTTP app from its dependencies. It does not listen, open the database
 * or start mail: server/index.ts does that, and tests pass their own pieces.
 */
export function createApp(deps: AppDeps): AppHandle {
  const auth = createAuth({
    db: deps.database.db,
    config: deps.config,
    mailer: deps.mailer,
    logger: deps.logger,
    onUserCreated: (user) => createPersonalWorkspace(deps.database.db, user),
  });
  const ctx: AppContext = { ...deps, auth, version: deps.version ?? packageVersion(deps.config.rootDir) };
  if (deps.config.workerThreads !== undefined) configureComputeThreads(deps.config.workerThreads);
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', deps.config.trustProxy);

  app.use(
    pinoHttp({
      logger: deps.logger,
      genReqId: (req, res) => {
        const given = req.headers['x-request-id'];
        const id = typeof given === 'string' && /^[\w.-]{1,64}$/.test(given) ? given : randomUUID();
        res.setHeader('X-Request-Id', id);
        return id;
      },
      serializers: {
        req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: req.url }),
        res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      },
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info'),
    }),
  );
  app.use(securityHeaders());
  // Scripts, styles, HTML and JSON go out compressed (brotli or gzip, as the client accepts);
  // recording bytes and fonts are already dense and are sent as they are.
  app.use(compression());

  mountAuth(app, ctx);
  app.use('/api', originGuard(deps.config.trustedOrigins), express.json({ limit: JSON_LIMIT }));
  app.use('/api', healthRoutes(ctx));
  app.use('/api/samples', sampleRoutes());
  const signedIn = requireSession(auth);
  // Working together: these routers check the session per route, as some of their routes are public.
  const db = deps.database.db;
  const clientDir = join(deps.config.rootDir, 'dist', 'client');
  const readerPages = publishedPageRoutes(clientDir, { read: (slug) => readPublishedForPage(db, slug), current: (notebookId) => currentPublication(db, notebookId) });
  // A page just published is rendered right away, so its first reader does not wait for that.
  app.use('/api', exportRoutes(ctx), runRoutes(ctx), shareRoutes(ctx), publicationRoutes(ctx, { onPublished: (slug) => void readerPages.prepare(slug) }));
  app.use('/api', invitationRoutes(ctx));
  app.use('/api/workspaces', signedIn, workspaceRoutes(ctx));
  app.use('/api/notebooks', signedIn, notebookRoutes(ctx));
  app.use('/api/uploads', signedIn, uploadRoutes(ctx));
  app.use('/api/outbox', signedIn, outboxRoutes(ctx));
  app.use('/api', notFoundHandler);

  mountClient(app, clientDir, readerPages);
  app.use(errorHandler(deps.logger, deps.config.uploadLimitMb));
  return { app, auth };
}

/**
 * better-auth's routes, before express.json() (it reads the raw body itself). Sign-in
 * and the mail-sending routes get a per-address limit keyed on Express's req.ip, which
 * honours the "trust proxy" setting; better-auth's own limiter reads the same address
 * through a header we set here and nobody else can.
 */
function mountAuth(app: Express, ctx: AppContext): void {
  const limited = (limit: number) =>
    rateLimit({
      windowMs: 15 * 60 * 1000,
      limit,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      handler: (_req, res) => {
        res.status(429).json({ error: { code: 'rate_limited', message: 'Too many attempts from your address. Wait a few minutes and try again.' } });
      },
    });
  // better-auth checks Origin only when a cookie comes along; a cross-site sign-up or sign-in
  // without one would still log the visitor into an account the other site chose.
  app.use('/api/auth', originGuard(ctx.config.trustedOrigins));
  app.post('/api/auth/sign-in/email', limited(ctx.config.signInLimit));
  app.post(['/api/auth/sign-up/email', '/api/auth/request-password-reset'], limited(ctx.config.signInLimit));
  const handler = toNodeHandler(ctx.auth);
  app.all('/api/auth/{*any}', (req, res) => {
    req.headers[CLIENT_IP_HEADER] = req.ip ?? '';
    return handler(req, res);
  });
}

/** The built SPA: hashed assets, then index.html for any other GET. */
function mountClient(app: Express, clientDir: string, readerPages: PublishedPages): void {
  app.use(
    '/assets',
    express.static(join(clientDir, 'assets'), {
      immutable: true,
      maxAge: '1y',
      fallthrough: true,
      setHeaders: (res, path) => {
        if (isEngineWorkerAsset(basename(path))) res.setHeader('Content-Security-Policy', ENGINE_WORKER_CSP);
      },
    }),
  );
  app.use('/assets', notFoundHandler);
  app.use(express.static(clientDir, { index: false }));
  app.use(readerPages.router);
  app.get('/{*splat}', (_req, res, next) => {
    const index = join(clientDir, 'index.html');
    if (!existsSync(index)) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(index);
  });
  app.use((_req, res) => {
    res.status(404).json({ error: { code: 'not_found', message: 'Nothing here. (Is the client built? Run npm run build:client.)' } });
  });
}

function packageVersion(rootDir: string): string {
  try {
    return (JSON.parse(readFileSync(join(rootDir, 'package.json'), 'utf8')) as { version?: string }).version ?? '0.0.0';
  } catch {
    return '0.0.0';
  }
}
