import { request, type IncomingHttpHeaders } from 'node:http';
import type { AddressInfo } from 'node:net';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import type { Express } from 'express';
import supertest from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import type { Db } from '../../server/db/client.js';
import { deletePublication, findPublicationBySlug, replacePublicationSnapshot, upsertPublication } from '../../server/db/repositories/publications.js';
import { readPublishedForPage } from '../../server/routes/publications-page.js';
import { missesDrawings, withDrawings } from '../../server/services/published-drawings.js';
import { PGLITE_TRUST_MS, PublishedPageCache, publishedPagesOf } from '../../server/services/published-pages.js';
import { publishedNotebookResponseSchema, type PublishedNotebookResponse } from '../../shared/api/publications.js';
import type { Snapshot } from '../../shared/api/snapshots.js';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { createTestApp, personalWorkspaceOf, signUp, type Agent, type TestApp } from './helpers/test-app.js';

/**
 * GET /api/published/:slug keeps each publication's snapshot in memory and checks it
 * against the publication's row on every read, so other processes sharing the database
 * (republishing, unpublishing) are seen at once; ETag, Cache-Control and compressed
 * copies come with it.
 */
let t: TestApp;
let editor: Agent;
let editorId: string;
let notebookId: string;
let slug: string;

/** The database, counting the queries run through it (every repository query starts with select, insert, update or delete). */
function counting(db: Db): { db: Db; queries: () => number } {
  let n = 0;
  const proxy = new Proxy(db, {
    get(target, key, receiver) {
      const value = Reflect.get(target, key, receiver) as unknown;
      if (typeof value !== 'function') return value;
      if (key === 'select' || key === 'insert' || key === 'update' || key === 'delete' || key === 'execute') {
        return (...args: unknown[]) => {
          n++;
          return (value as (...a: unknown[]) => unknown).apply(target, args);
        };
      }
      return value.bind(target);
    },
  });
  return { db: proxy, queries: () => n };
}

/** One GET on a listening copy of the app, bytes exactly as sent (no decoding by the client). */
async function raw(app: Express, path: string, headers: Record<string, string>): Promise<{ status: number; headers: IncomingHttpHeaders; body: Buffer }> {
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  try {
    const { port } = server.address() as AddressInfo;
    return await new Promise((resolve, reject) => {
      request({ host: '127.0.0.1', port, path, headers }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
        res.on('error', reject);
      })
        .on('error', reject)
        .end();
    });
  } finally {
    server.close();
  }
}

function parsePage(body: Buffer): PublishedNotebookResponse {
  return publishedNotebookResponseSchema.parse(JSON.parse(body.toString('utf8')));
}

beforeAll(async () => {
  t = await createTestApp();
}, 180_000);
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  const signed = await signUp(t, 'editor@lab.test', 'Eda Editor');
  editor = signed.agent;
  editorId = signed.userId;
  const ws = await personalWorkspaceOf(editor);
  const up = async (watts: number, name: string) =>
    (await editor.post('/api/uploads').field('workspaceId', ws).attach('file', Buffer.from(fitBytes(20, watts)), name).expect(201)).body.uploads[0].id as string;
  const doc = { ...recipeDoc({ reference: await up(200, 'reference.fit'), test: await up(220, 'crank.fit') }), description: 'Steps at 200 and 220 W.' };
  notebookId = (await editor.post('/api/notebooks').send({ workspaceId: ws, document: doc }).expect(201)).body.notebook.id;
  slug = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({ allowDownloads: true }).expect(200)).body.slug;
}, 120_000);

describe('the kept snapshot', () => {
  it('is read once; later reads run one small query, and readers arriving together share it', async () => {
    const cache = new PublishedPageCache();
    const { db, queries } = counting(t.database.db);
    const first = await cache.read(db, slug);
    const page = parsePage(first.body);
    expect(page.title).toBe('Mean power, reference vs device');
    expect(page.description).toBe('Steps at 200 and 220 W.');
    expect(page.files!.map((f) => f.fileName)).toEqual(['reference.fit', 'crank.fit']);
    // Publication with its snapshot, the revision's description, one upload per input.
    expect(queries()).toBe(4);

    const before = queries();
    const again = await cache.read(db, slug);
    expect(queries() - before).toBe(1);
    expect(again.body.equals(first.body)).toBe(true);
    expect(again.etag).toBe(first.etag);

    const together = queries();
    const pages = await Promise.all(Array.from({ length: 20 }, () => cache.read(db, slug)));
    expect(queries() - together).toBe(1);
    for (const p of pages) expect(p.etag).toBe(first.etag);
    expect(cache.stats.fills).toBe(1);
  });

  it('answers exactly what a fresh read of the database gives', async () => {
    const warm = new PublishedPageCache();
    await warm.read(t.database.db, slug);
    const kept = await warm.read(t.database.db, slug);
    const fresh = await new PublishedPageCache().read(t.database.db, slug);
    expect(kept.body.equals(fresh.body)).toBe(true);
    const stored = await findPublicationBySlug(t.database.db, slug);
    expect(parsePage(kept.body).snapshot).toEqual(stored!.snapshot);
  });

  it('sees a republish and an unpublish made by another process on the same database', async () => {
    const cache = new PublishedPageCache();
    const before = parsePage((await cache.read(t.database.db, slug)).body);
    // Another process republishes: only the database changes, this process's cache is not told.
    const stored = await findPublicationBySlug(t.database.db, slug);
    const snapshot = structuredClone(stored!.snapshot) as Snapshot;
    snapshot.cells = snapshot.cells.slice(0, 2);
    await new Promise((r) => setTimeout(r, 5)); // a later publishing time
    await upsertPublication(t.database.db, { notebookId, slug, revision: stored!.revision, snapshot, allowDownloads: false, publishedBy: editorId });
    const after = parsePage((await cache.read(t.database.db, slug)).body);
    expect(before.snapshot.cells.length).toBeGreaterThan(2);
    expect(after.snapshot.cells.length).toBe(2);
    expect(after.files).toBeNull();
    expect(after.publishedAt).not.toBe(before.publishedAt);
    expect(cache.stats.fills).toBe(2);

    await deletePublication(t.database.db, notebookId);
    await expect(cache.read(t.database.db, slug)).rejects.toMatchObject({ status: 404 });
  });

  it('shows the notebook title as it is now, without republishing, under a new ETag', async () => {
    const cache = new PublishedPageCache();
    const first = await cache.read(t.database.db, slug);
    const current = (await editor.get(`/api/notebooks/${notebookId}`).expect(200)).body;
    await editor.put(`/api/notebooks/${notebookId}`).send({ baseRevision: current.revision, document: { ...current.document, title: 'Renamed later' } }).expect(200);
    const renamed = await cache.read(t.database.db, slug);
    expect(parsePage(renamed.body).title).toBe('Renamed later');
    // Still the published revision and snapshot: renaming is no republish.
    expect(parsePage(renamed.body).revision).toBe(1);
    expect(renamed.etag).not.toBe(first.etag);
    expect(cache.stats.fills).toBe(1);
  });
});

describe('a publication from before charts were drawn on the server', () => {
  /** Takes the drawings out of the stored publication, as publishing did before it drew them. */
  async function undraw(): Promise<Snapshot> {
    const row = (await findPublicationBySlug(t.database.db, slug))!;
    const snapshot = structuredClone(row.snapshot) as Snapshot;
    for (const c of snapshot.cells) if (c.result?.type === 'chart') delete c.result.svg;
    expect(await replacePublicationSnapshot(t.database.db, row.notebookId, row.publishedAt, snapshot)).toBe(true);
    expect(missesDrawings((await findPublicationBySlug(t.database.db, slug))!.snapshot as Snapshot)).toBe(true);
    return snapshot;
  }

  it('gets its charts drawn on the first read, stored with it, for readers arriving together and every later one', async () => {
    const undrawn = await undraw();
    const pages = await Promise.all(Array.from({ length: 3 }, () => supertest(t.app).get(`/api/published/${slug}`).expect(200)));
    for (const res of pages) {
      const charts = publishedNotebookResponseSchema.parse(res.body).snapshot.cells.filter((c) => c.result?.type === 'chart');
      expect(charts.length).toBeGreaterThan(0);
      for (const c of charts) expect((c.result as { svg?: string }).svg).toMatch(/^<svg[^>]* class="marks"/);
    }
    // Stored: a fresh process (a new cache) reads the drawings from the database.
    const stored = (await findPublicationBySlug(t.database.db, slug))!.snapshot as Snapshot;
    expect(missesDrawings(stored)).toBe(false);
    // Only the drawings were added: everything else is the snapshot as published.
    const withoutSvg = structuredClone(stored);
    for (const c of withoutSvg.cells) if (c.result?.type === 'chart') delete c.result.svg;
    expect(withoutSvg).toEqual(undrawn);
    expect(parsePage((await new PublishedPageCache().read(t.database.db, slug)).body).snapshot).toEqual(stored);
  });

  it('gets them for the server-rendered page too', async () => {
    await undraw();
    const source = (await readPublishedForPage(t.database.db, slug))!;
    expect(missesDrawings(source.page.snapshot)).toBe(false);
  });

  it('is answered without them when drawing takes too long, and has them on a later read', async () => {
    await undraw();
    const row = (await findPublicationBySlug(t.database.db, slug))!;
    expect(missesDrawings(await withDrawings(t.database.db, row, 0))).toBe(true);
    // The drawing went on: a reader a moment later waits for it and gets it.
    expect(missesDrawings(await withDrawings(t.database.db, row))).toBe(false);
    expect(missesDrawings((await findPublicationBySlug(t.database.db, slug))!.snapshot as Snapshot)).toBe(false);
  });

  it('never overwrites a publication republished or unpublished meanwhile', async () => {
    const row = (await findPublicationBySlug(t.database.db, slug))!;
    const earlier = new Date(row.publishedAt.getTime() - 60_000);
    expect(await replacePublicationSnapshot(t.database.db, row.notebookId, earlier, { cells: [] })).toBe(false);
    expect((await findPublicationBySlug(t.database.db, slug))!.snapshot).toEqual(row.snapshot);
  });
});

describe('trusting a checked page for a while', () => {
  it('sends it without a query until the time is up or it is forgotten', async () => {
    const cache = new PublishedPageCache({ trustForMs: 60_000 });
    const { db, queries } = counting(t.database.db);
    const first = await cache.read(db, slug);
    const before = queries();
    await Promise.all(Array.from({ length: 5 }, () => cache.read(db, slug)));
    expect(queries() - before).toBe(0);
    // A rename is not seen while the page is trusted; forgetting (as publishing or unpublishing does) ends that.
    const current = (await editor.get(`/api/notebooks/${notebookId}`).expect(200)).body;
    await editor.put(`/api/notebooks/${notebookId}`).send({ baseRevision: current.revision, document: { ...current.document, title: 'Renamed later' } }).expect(200);
    expect((await cache.read(db, slug)).etag).toBe(first.etag);
    cache.forget(slug);
    expect(parsePage((await cache.read(db, slug)).body).title).toBe('Renamed later');
  });

  it('keeps nothing a read fetched while the page was being forgotten', async () => {
    const cache = new PublishedPageCache({ trustForMs: 60_000 });
    const reading = cache.read(t.database.db, slug);
    cache.forget(slug); // e.g. a republish committed while the snapshot was on its way
    await reading;
    await cache.read(t.database.db, slug);
    expect(cache.stats.fills).toBe(2);
  });

  it('on embedded PGlite the app trusts a checked page for a second; on PostgreSQL it checks every read', async () => {
    const cache = publishedPagesOf(t.database);
    expect(publishedPagesOf(t.database)).toBe(cache);
    await cache.read(t.database.db, slug);
    const { db, queries } = counting(t.database.db);
    await cache.read(db, slug);
    expect(queries()).toBe(t.database.kind === 'pglite' ? 0 : 1);
    if (t.database.kind === 'pglite') {
      await new Promise((r) => setTimeout(r, PGLITE_TRUST_MS + 50));
      await cache.read(db, slug);
      expect(queries()).toBe(1);
    }
  });
});

describe('GET /api/published/:slug', () => {
  it('answers with an ETag, asks caches to revalidate, and answers 304 while nothing changed', async () => {
    const path = `/api/published/${slug}`;
    const first = await raw(t.app, path, {});
    expect(first.status).toBe(200);
    expect(first.headers['content-type']).toMatch(/^application\/json/);
    expect(first.headers['cache-control']).toBe('public, no-cache');
    const etag = first.headers.etag!;
    expect(etag).toMatch(/^W\/"[\w-]+"$/);
    expect(parsePage(first.body).slug).toBe(slug);

    const unchanged = await raw(t.app, path, { 'if-none-match': etag });
    expect(unchanged.status).toBe(304);
    expect(unchanged.body.length).toBe(0);
    expect(unchanged.headers.etag).toBe(etag);

    // Republishing through this process: the old tag no longer matches.
    await editor.post(`/api/notebooks/${notebookId}/publication`).send({ allowDownloads: false }).expect(200);
    const changed = await raw(t.app, path, { 'if-none-match': etag });
    expect(changed.status).toBe(200);
    expect(changed.headers.etag).not.toBe(etag);
    expect(parsePage(changed.body).files).toBeNull();

    await editor.delete(`/api/notebooks/${notebookId}/publication`).expect(204);
    expect((await raw(t.app, path, { 'if-none-match': changed.headers.etag! })).status).toBe(404);
  });

  it('sends brotli or gzip to clients that take them, the same JSON as plain, soon from a kept copy', async () => {
    const path = `/api/published/${slug}`;
    const plain = await raw(t.app, path, {});
    expect(plain.headers['content-encoding']).toBeUndefined();
    for (const [accept, coding, decode] of [
      ['gzip, deflate, br', 'br', brotliDecompressSync],
      ['gzip', 'gzip', gunzipSync],
    ] as const) {
      // The first answers are compressed on the way out; a kept copy follows within moments.
      let kept = false;
      for (let i = 0; i < 100 && !kept; i++) {
        const res = await raw(t.app, path, { 'accept-encoding': accept });
        expect(res.status).toBe(200);
        expect(res.headers['content-encoding']).toBe(coding);
        expect(res.headers.vary).toMatch(/Accept-Encoding/i);
        expect(res.headers.etag).toBe(plain.headers.etag);
        expect(decode(res.body).equals(plain.body)).toBe(true);
        // A kept copy is sent whole with its length; the middleware streams (chunked).
        kept = res.headers['content-length'] === String(res.body.length);
        if (!kept) await new Promise((r) => setTimeout(r, 20));
      }
      expect(kept, `a kept ${coding} copy`).toBe(true);
    }
  });
});
