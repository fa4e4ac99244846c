import { createHash } from 'node:crypto';
import { readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Router } from 'express';
import type { PublishedNotebookResponse } from '../../shared/api/publications.js';
import { publicationSlugParamsSchema } from '../../shared/api/publications.js';
import type { Db } from '../db/client.js';
import { findPublicationBySlug, findPublicationOfNotebook, type PublicationRecord } from '../db/repositories/publications.js';
import { withDrawings } from '../services/published-drawings.js';
import { bodyFor, publishedFiles, type PublishedPage } from '../services/published-pages.js';
import { revisionDocument } from '../services/snapshot.js';

/** The server's render of the published page (src/published-ssr.ts, built into dist/ssr). */
interface PublishedRenderer {
  renderPublishedPage(slug: string, page: PublishedNotebookResponse): Promise<string>;
}

/** A publication's content for the page, with what identifies this publication of it. */
export interface PublishedPageSource {
  page: PublishedNotebookResponse;
  notebookId: string;
  /** Changes whenever the page would (republished, renamed, downloads allowed or not). */
  stamp: string;
}

export interface PublishedPageOptions {
  /** The published page's content, as `GET /api/published/:slug` answers it; undefined when nothing is published there. */
  read: (slug: string) => Promise<PublishedPageSource | undefined>;
  /** The slug and stamp of a notebook's publication from its small row (no snapshot): the cheap check that a kept render is current. */
  current: (notebookId: string) => Promise<{ slug: string; stamp: string } | undefined>;
  /** Folder of the server render's build (default `<clientDir>/../ssr`). */
  ssrDir?: string;
}

/** Rendered pages kept, by slug (a page of a large finding is about 1 MB of HTML). */
const KEPT_PAGES = 16;

/**
 * The published page for signed-out readers: the client build's published.html (an entry of
 * its own, without the editor's code) with
 * - the finding rendered into it by the server (title, numbers, tables, notes and the charts
 *   the server drew at publishing), so a reader sees it before any script runs; the page's
 *   script takes that markup over afterwards. Left out when some chart was not drawn on the
 *   server, when nothing is published at the address, or without a server render build: the
 *   page's script then renders everything itself, as it always can;
 * - a preload link that starts the page's one API request, `GET /api/published/:slug`, while
 *   the browser is still reading the HTML, in parallel with the scripts.
 * The page's style sheets are written into it (see inlineStyles). Without a built published.html
 * the app's own page serves these addresses (its router has the same route).
 */
export function publishedPageRoutes(clientDir: string, options: PublishedPageOptions): PublishedPages {
  const router = Router();
  const template = watchedFile(join(clientDir, 'published.html'), (text) => inlineStyles(text, clientDir));
  const ssrFile = join(options.ssrDir ?? join(clientDir, '..', 'ssr'), 'published-ssr.js');
  // A new build brings a new render and forgets the pages the old one made.
  const kept = new Map<string, KeptRender>();
  const renderer = watchedFile(ssrFile, (_text, mtimeMs) => {
    kept.clear();
    return import(`${pathToFileURL(ssrFile).href}?v=${mtimeMs}`) as Promise<PublishedRenderer>;
  });
  // Renders under way, by slug: readers arriving meanwhile wait for the same one.
  const rendering = new Map<string, Promise<KeptRender | undefined>>();

  async function article(slug: string): Promise<KeptRender | undefined> {
    const running = rendering.get(slug);
    if (running) {
      // Begun before this reader came: still the publication now (not withdrawn or republished meanwhile)?
      const joined = await running;
      const now = joined && (await options.current(joined.notebookId).catch(() => undefined));
      return now && now.slug === slug && now.stamp === joined.stamp ? joined : undefined;
    }
    const started = renderArticle(slug).finally(() => {
      if (rendering.get(slug) === started) rendering.delete(slug);
    });
    rendering.set(slug, started);
    return started;
  }

  async function renderArticle(slug: string): Promise<KeptRender | undefined> {
    const render = renderer();
    if (!render) return undefined;
    const known = kept.get(slug);
    if (known) {
      // Still the same publication (unpublishing or republishing shows at once): reuse its render.
      const now = await options.current(known.notebookId).catch(() => undefined);
      if (now?.slug === slug && now.stamp === known.stamp) return known;
      kept.delete(slug);
    }
    // Not published (or not readable now): the page's script says so.
    const found = await options.read(slug).catch(() => undefined);
    if (!found || found.page.snapshot.cells.some((c) => c.result?.type === 'chart' && !c.result.svg)) return undefined;
    let html: string;
    try {
      html = await (await render).renderPublishedPage(slug, found.page);
    } catch {
      return undefined; // a render that fails leaves the page to its script
    }
    const entry: KeptRender = { notebookId: found.notebookId, stamp: found.stamp, html, title: found.page.title };
    kept.set(slug, entry);
    while (kept.size > KEPT_PAGES) kept.delete(kept.keys().next().value!);
    return entry;
  }

  /** The page at `slug` with its server render, made (and compressed) once per render and build; undefined without a render. */
  async function renderedPage(slug: string, html: string): Promise<PublishedPage | undefined> {
    const rendered = await article(slug);
    if (!rendered) return undefined;
    if (rendered.page?.template !== html) {
      const body = withPreload(html, slug)
        .replace(/<title>[^<]*<\/title>/, () => `<title>${escapeHtml(rendered.title)} · Cogbook</title>`)
        .replace('<div id="app"></div>', () => `<div id="app" data-rendered="server">${rendered.html}</div>`);
      rendered.page = { template: html, page: keptPage(body) };
    }
    return rendered.page.page;
  }

  router.get(['/p/:slug', '/published/:slug'], async (req, res, next) => {
    const html = template();
    if (html === undefined) return next();
    res.setHeader('Cache-Control', 'no-cache');
    const parsed = publicationSlugParamsSchema.safeParse(req.params);
    if (!parsed.success) return res.type('html').send(html);
    const page = await renderedPage(parsed.data.slug, html);
    if (!page) return res.type('html').send(withPreload(html, parsed.data.slug));
    res.setHeader('ETag', page.etag);
    res.vary('Accept-Encoding');
    if (req.fresh) return res.status(304).end();
    const { body, encoding } = bodyFor(page, (coding) => req.acceptsEncodings(coding) === coding);
    if (encoding) res.setHeader('Content-Encoding', encoding);
    res.type('html').send(body);
  });

  return {
    router,
    async prepare(slug) {
      const html = template();
      const page = html === undefined ? undefined : await renderedPage(slug, html).catch(() => undefined);
      // Its compressed copies too (brotli for browsers, gzip for the rest), made in the background as for a reader.
      if (page) for (const coding of ['br', 'gzip'] as const) bodyFor(page, (c) => c === coding);
    },
  };
}

/** The reader page's routes, and a way to have a page ready before its first reader asks. */
export interface PublishedPages {
  router: Router;
  /** Renders and compresses the page at `slug` now (after publishing), so its first reader need not wait for that. Never throws. */
  prepare(slug: string): Promise<void>;
}

/**
 * The page with a preload link that starts the page's one API request while the browser is
 * still reading the HTML: the same request the page's script makes (fetch: CORS mode,
 * same-origin credentials), so the browser hands it the preloaded answer. First thing in the
 * head after the title, so it starts before the scripts and styles.
 */
function withPreload(html: string, slug: string): string {
  return html.replace('</title>', `</title>\n    <link rel="preload" href="/api/published/${encodeURIComponent(slug)}" as="fetch" crossorigin="anonymous">`);
}

/** A publication's server render, and the page last made from it. */
interface KeptRender {
  notebookId: string;
  stamp: string;
  html: string;
  title: string;
  /** The whole page built on `html` with the reader page's build `template`, with its compressed copies. */
  page?: { template: string; page: PublishedPage };
}

/** A page ready to send as it is, with a weak entity tag of its text. */
function keptPage(html: string): PublishedPage {
  const body = Buffer.from(html);
  return { body, etag: `W/"${createHash('sha256').update(body).digest('base64url').slice(0, 27)}"`, encoded: {}, compressing: new Set() };
}

/**
 * The page's own style sheets written into it (the policy allows inline styles), so the
 * browser can paint the finding as soon as it has the HTML, without a round trip per sheet.
 * Each keeps its link, disabled: a disabled style sheet is neither fetched nor applied (HTML
 * standard, "link type stylesheet"), and the script loader that the page's view comes with
 * (Vite's) loads a sheet the view needs only when no link to it is in the page, so the view
 * does not wait for sheets the page already has. A sheet that cannot be read stays a link.
 */
function inlineStyles(html: string, clientDir: string): string {
  return html.replace(/<link rel="stylesheet"(?: crossorigin)? href="\/assets\/([\w.-]+\.css)">/g, (link, file: string) => {
    try {
      const css = readFileSync(join(clientDir, 'assets', file), 'utf8');
      return css.includes('</') ? link : `<style>${css}</style><link rel="stylesheet" href="/assets/${file}" disabled>`;
    } catch {
      return link;
    }
  });
}

/** A file's contents made into `T`, read again (and made again) whenever the file changes; undefined while it is missing. */
function watchedFile<T>(file: string, make: (text: string, mtimeMs: number) => T): () => T | undefined {
  let cached: { mtimeMs: number; value: T } | undefined;
  return () => {
    let mtimeMs: number;
    try {
      mtimeMs = statSync(file).mtimeMs;
    } catch {
      return undefined;
    }
    if (cached?.mtimeMs !== mtimeMs) cached = { mtimeMs, value: make(readFileSync(file, 'utf8'), mtimeMs) };
    return cached.value;
  };
}

/** What identifies one publication of a notebook as readers see it. */
function stampOf(row: PublicationRecord): string {
  return JSON.stringify([row.revision, row.publishedAt.toISOString(), row.title, row.publishedByName, row.allowDownloads]);
}

/**
 * A published page's content for the server's render: what `GET /api/published/:slug` answers
 * (the page's script takes the render over with that answer, so the two must agree), or
 * undefined when nothing is published at `slug`.
 */
export async function readPublishedForPage(db: Db, slug: string): Promise<PublishedPageSource | undefined> {
  const found = await findPublicationBySlug(db, slug);
  if (!found) return undefined;
  const snapshot = await withDrawings(db, found);
  const document = await revisionDocument(db, found.notebookId, found.revision);
  const files = found.allowDownloads ? await publishedFiles(db, snapshot) : null;
  const page: PublishedNotebookResponse = {
    slug: found.slug,
    title: found.title,
    description: document.description,
    publishedBy: found.publishedByName === null ? null : { name: found.publishedByName },
    publishedAt: found.publishedAt.toISOString(),
    revision: found.revision,
    snapshot,
    allowDownloads: found.allowDownloads,
    files,
  };
  return { page, notebookId: found.notebookId, stamp: stampOf(found) };
}

/** The slug and stamp of a notebook's publication, without its snapshot. */
export async function currentPublication(db: Db, notebookId: string): Promise<{ slug: string; stamp: string } | undefined> {
  const row = await findPublicationOfNotebook(db, notebookId);
  return row ? { slug: row.slug, stamp: stampOf(row) } : undefined;
}

const ESCAPES: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };
function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ESCAPES[c]!);
}
