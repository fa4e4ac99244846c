import { mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { get, type IncomingHttpHeaders } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import { sql } from 'drizzle-orm';
import type { Express } from 'express';
import supertest from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { publishedNotebookResponseSchema } from '../../shared/api/publications.js';
import { chartSvg, isPlainSvg } from '../../server/engine/chart-svg.js';
import { fitBytes } from './helpers/fixtures.js';
import { recipeDoc } from './helpers/recipe-notebook.js';
import { createTestApp, personalWorkspaceOf, signUp, TEST_PASSWORD, type Agent, type TestApp } from './helpers/test-app.js';

let t: TestApp;
let editor: Agent;
let notebookId: string;

/** One GET on a listening copy of the app, with the response bytes exactly as sent (no client-side decoding). */
async function raw(app: Express, path: string, acceptEncoding: string, headers: Record<string, string> = {}): Promise<{ status: number; headers: IncomingHttpHeaders; body: Buffer }> {
  const server = app.listen(0, '127.0.0.1');
  await new Promise((r) => server.once('listening', r));
  try {
    const { port } = server.address() as AddressInfo;
    return await new Promise((resolve, reject) => {
      get({ host: '127.0.0.1', port, path, headers: { 'accept-encoding': acceptEncoding, ...headers } }, (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body: Buffer.concat(chunks) }));
        res.on('error', reject);
      }).on('error', reject);
    });
  } finally {
    server.close();
  }
}

/** A stand-in for dist/ssr/published-ssr.js (built by vite.ssr.config.ts; the browser suite uses the real one); it counts its renders in `globalThis.standInRenders` and waits for `globalThis.standInGate`, when set. */
function writeStandInRender(root: string): void {
  mkdirSync(join(root, 'dist', 'ssr'), { recursive: true });
  writeFileSync(
    join(root, 'dist', 'ssr', 'published-ssr.js'),
    'export async function renderPublishedPage(slug, page) { globalThis.standInRenders = (globalThis.standInRenders ?? 0) + 1; await globalThis.standInGate; return `<article data-slug="${slug}">${page.snapshot.cells.length} cells, ${page.snapshot.cells.filter((c) => c.result && c.result.svg).length} drawn</article>`; }',
  );
}

beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => t.close());
beforeEach(async () => {
  await t.reset();
  editor = (await signUp(t, 'editor@lab.test')).agent;
  const ws = await personalWorkspaceOf(editor);
  const up = async (watts: number, name: string) =>
    (await editor.post('/api/uploads').field('workspaceId', ws).attach('file', Buffer.from(fitBytes(60, watts)), name).expect(201)).body.uploads[0].id as string;
  const [reference, test] = [await up(200, 'reference.fit'), await up(220, 'crank.fit')];
  const doc = recipeDoc({ reference, test });
  // A title a reader's page must show as text, never as markup.
  const chart = doc.cells.find((c) => c.kind === 'chart')!;
  (chart.config as { title?: string }).title = '<img src=x onerror="alert(1)"> & </text><script>alert(2)</script>';
  notebookId = (await editor.post('/api/notebooks').send({ workspaceId: ws, document: doc }).expect(201)).body.notebook.id;
});

describe('charts drawn at publish time', () => {
  it('stores every chart of a published snapshot as plain SVG, its text escaped', async () => {
    const pub = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body as { slug: string };
    const page = publishedNotebookResponseSchema.parse((await supertest(t.app).get(`/api/published/${pub.slug}`).expect(200)).body);
    const chart = page.snapshot.cells.find((c) => c.name === 'trace')!.result;
    expect(chart?.type).toBe('chart');
    const svg = (chart as { svg?: string }).svg!;
    expect(svg.startsWith('<svg')).toBe(true);
    expect(svg).toMatch(/class="marks"/);
    // Drawn at the published page's chart width, with a viewBox so it scales to narrower screens and paper.
    expect(svg).toMatch(/width="816"/);
    expect(svg).toMatch(/viewBox="0 0 816 \d+"/);
    // The line of each device is there: one path per series, with many points.
    expect((svg.match(/class="mark-line/g) ?? []).length).toBeGreaterThan(0);
    expect(svg).toContain('&lt;img src=x onerror=');
    expect(svg).not.toContain('<img');
    expect(svg).not.toContain('<script');
    expect(isPlainSvg(svg)).toBe(true);
  });

  it('draws no SVG for stored runs, which readers of the app see drawn live', async () => {
    const run = (await editor.post(`/api/notebooks/${notebookId}/runs`).send({}).expect(201)).body as { snapshot?: { cells: { result?: { type: string; svg?: string } }[] } };
    const charts = (run.snapshot?.cells ?? []).filter((c) => c.result?.type === 'chart');
    expect(charts.length).toBeGreaterThan(0);
    expect(charts.every((c) => c.result!.svg === undefined)).toBe(true);
  });
});

describe('a chart drawn on the server', () => {
  const scatter = (n: number) => ({
    width: 'container',
    title: 'Agreement',
    data: { values: Array.from({ length: n }, (_, i) => ({ mean: 100 + i, diff: Math.sin(i) * 10 })) },
    mark: 'point',
    encoding: { x: { field: 'mean', type: 'quantitative', title: 'Mean of both (W)' }, y: { field: 'diff', type: 'quantitative' } },
  });

  it('labels each mark of a small chart, and only the axes, title and legend of one with many points', async () => {
    const few = await chartSvg(scatter(20));
    expect((few.match(/role="graphics-symbol" aria-roledescription="point"/g) ?? []).length).toBe(20);
    const many = await chartSvg(scatter(2000));
    expect((many.match(/role="graphics-symbol" aria-roledescription="point"/g) ?? []).length).toBe(0);
    expect((/<g class="mark-symbol role-mark[^>]*>(.*?)<\/g>/.exec(many)![1]!.match(/<circle /g) ?? []).length).toBe(2000);
    expect(many).toContain("aria-label=\"X-axis titled 'Mean of both (W)'");
    expect(many).toContain('>Agreement</text>');
    // A container-wide chart gets the published page's width.
    expect(many).toMatch(/^<svg[^>]* width="816"/);
  });
});

describe('the SVG check', () => {
  it('passes what vega draws and refuses anything that could run or load', () => {
    const ok = '<svg class="marks" width="10" height="10" viewBox="0 0 10 10"><g><path d="M0,0h1" fill="url(#gradient_1)"/><text>a &lt;b&gt; onclick="x"</text></g></svg>';
    expect(isPlainSvg(ok)).toBe(true);
    for (const bad of [
      '<svg><script>alert(1)</script></svg>',
      '<svg><g onclick="alert(1)"></g></svg>',
      '<svg><a href="javascript:alert(1)"><text>x</text></a></svg>',
      '<svg><image href="https://elsewhere.test/x.png"/></svg>',
      '<svg><foreignObject><div>x</div></foreignObject></svg>',
      '<svg><rect fill="url(https://elsewhere.test/x)"/></svg>',
      '<svg><rect style="background:url(x)"/></svg>',
      '<div>not svg</div>',
    ]) {
      expect(isPlainSvg(bad), bad).toBe(false);
    }
  });
});

/** A stand-in for the client build's published.html. */
const READER_HTML =
  '<!doctype html><html><head><title>Published finding</title><script type="module" src="/assets/published-abc.js"></script></head><body>reader<div id="app"></div></body></html>';

describe('the published page and compressed responses', () => {
  let root: string;
  const script = `console.log(${JSON.stringify('a chart page '.repeat(400))});`;
  beforeAll(() => {
    // A throwaway client build, so the test does not depend on `vite build`.
    root = join(t.config.dataDir, 'root');
    mkdirSync(join(root, 'dist', 'client', 'assets'), { recursive: true });
    writeFileSync(join(root, 'dist', 'client', 'index.html'), '<!doctype html><html><head><title>Cogbook</title></head><body>app</body></html>');
    writeFileSync(join(root, 'dist', 'client', 'published.html'), READER_HTML);
    writeFileSync(join(root, 'dist', 'client', 'assets', 'published-abc.js'), script);
  });
  afterAll(() => rmSync(root, { recursive: true, force: true }));

  it('answers /p/:slug and /published/:slug with the reader page, which starts the snapshot request itself', async () => {
    const { app } = t.appWith({ rootDir: root });
    for (const path of ['/p/chainring-gain-3f9a', '/published/chainring-gain-3f9a']) {
      const res = await supertest(app).get(path).expect(200);
      expect(res.headers['content-type']).toMatch(/^text\/html/);
      expect(res.headers['cache-control']).toBe('no-cache');
      expect(res.text).toContain('<body>reader<div id="app"></div></body>');
      expect(res.text).toContain('<link rel="preload" href="/api/published/chainring-gain-3f9a" as="fetch" crossorigin="anonymous">');
      // Before the page's own script, so the request starts while the HTML is read.
      expect(res.text.indexOf('rel="preload"')).toBeLessThan(res.text.indexOf('<script'));
      expect(res.headers['content-security-policy']).toContain("script-src 'self'");
      expect(res.headers['content-security-policy']).not.toContain('unsafe-eval');
    }
    // A slug that cannot be one gets the page (which says so) but no preload.
    const odd = await supertest(app).get('/p/Not%20A%20Slug').expect(200);
    expect(odd.text).toContain('<body>reader<div id="app"></div></body>');
    expect(odd.text).not.toContain('rel="preload"');
    // Every other address is still the app.
    expect((await supertest(app).get('/notebooks/x').expect(200)).text).toContain('<body>app</body>');
  });

  it('writes the page\'s style sheets into it, so the first paint waits for no other request', async () => {
    writeFileSync(join(root, 'dist', 'client', 'assets', 'published-abc.css'), '.published{color:red}');
    const html = readFileSync(join(root, 'dist', 'client', 'published.html'), 'utf8');
    writeFileSync(join(root, 'dist', 'client', 'published.html'), html.replace('</head>', '<link rel="stylesheet" crossorigin href="/assets/published-abc.css"><link rel="stylesheet" crossorigin href="/assets/missing-abc.css"></head>'));
    try {
      const { app } = t.appWith({ rootDir: root });
      const res = await supertest(app).get('/p/chainring-gain-3f9a').expect(200);
      expect(res.text).toContain('<style>.published{color:red}</style>');
      // Its link stays as a disabled one (not fetched): the view's script loader then knows the sheet is in the page.
      expect(res.text).toContain('<link rel="stylesheet" href="/assets/published-abc.css" disabled>');
      expect(res.text).not.toContain('crossorigin href="/assets/published-abc.css"');
      // A sheet it cannot read stays a link.
      expect(res.text).toContain('<link rel="stylesheet" crossorigin href="/assets/missing-abc.css">');
    } finally {
      writeFileSync(join(root, 'dist', 'client', 'published.html'), html);
    }
  });

  it('renders the finding into the page with the server render build, and leaves it to the page otherwise', async () => {
    const pub = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body as { slug: string };
    writeStandInRender(root);
    try {
      const { app } = t.appWith({ rootDir: root });
      const res = await supertest(app).get(`/p/${pub.slug}`).expect(200);
      expect(res.text).toContain(`<div id="app" data-rendered="server"><article data-slug="${pub.slug}">5 cells, 1 drawn</article></div>`);
      // The finding's own title, escaped.
      expect(res.text).toContain('<title>Mean power, reference vs device · Cogbook</title>');
      await t.database.db.execute(sql`update notebook set title = ${'<b>$& $1 gain</b>'} where id = ${notebookId}`);
      expect((await supertest(app).get(`/p/${pub.slug}`).expect(200)).text).toContain('<title>&lt;b&gt;$&amp; $1 gain&lt;/b&gt; · Cogbook</title>');
      expect(res.text).toContain(`<link rel="preload" href="/api/published/${pub.slug}"`);
      // Nothing published there: the page as built, which says so itself.
      const none = await supertest(app).get('/p/no-such-finding').expect(200);
      expect(none.text).toContain('<div id="app"></div>');
      expect(none.text).toContain('<title>Published finding</title>');
      // A page kept from an earlier read goes as soon as the finding is unpublished, and comes back when it is published again.
      await editor.delete(`/api/notebooks/${notebookId}/publication`).expect(204);
      expect((await supertest(app).get(`/p/${pub.slug}`).expect(200)).text).toContain('<div id="app"></div>');
      const again = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body as { slug: string };
      expect((await supertest(app).get(`/p/${again.slug}`).expect(200)).text).toContain('data-rendered="server"');
      expect((await supertest(app).get(`/p/${pub.slug}`).expect(200)).text).toContain('<div id="app"></div>');
      // A chart the server did not draw (published before charts were drawn) is drawn on this first read, so the page still comes rendered.
      await t.database.db.execute(sql`update publication set snapshot = jsonb_set(snapshot, '{cells,4,result}', (snapshot #> '{cells,4,result}') - 'svg'), published_at = now()`);
      expect((await supertest(app).get(`/p/${again.slug}`).expect(200)).text).toContain(`<div id="app" data-rendered="server"><article data-slug="${again.slug}">5 cells, 1 drawn</article></div>`);
    } finally {
      rmSync(join(root, 'dist', 'ssr'), { recursive: true, force: true });
    }
  });

  it('makes a rendered page once and keeps it compressed, with an entity tag for readers who come back', async () => {
    const pub = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body as { slug: string };
    writeStandInRender(root);
    try {
      const { app } = t.appWith({ rootDir: root });
      const path = `/p/${pub.slug}`;
      const first = await raw(app, path, 'br');
      expect(first.status).toBe(200);
      const text = first.headers['content-encoding'] === 'br' ? brotliDecompressSync(first.body).toString() : first.body.toString();
      expect(text).toContain(`<div id="app" data-rendered="server"><article data-slug="${pub.slug}">`);
      expect(first.headers['etag']).toMatch(/^W\/"[\w-]{27}"$/);
      expect(first.headers['vary']).toMatch(/accept-encoding/i);
      // The compressed copy is made once, in the background: a later reader gets that copy, the same page.
      let kept = first;
      for (let i = 0; i < 100 && kept.headers['content-encoding'] !== 'br'; i++) {
        await new Promise((r) => setTimeout(r, 20));
        kept = await raw(app, path, 'br');
      }
      expect(kept.headers['content-encoding']).toBe('br');
      expect(brotliDecompressSync(kept.body).toString()).toBe(text);
      expect(kept.headers['etag']).toBe(first.headers['etag']);
      const gz = await raw(app, path, 'identity');
      expect(gz.headers['content-encoding']).toBeUndefined();
      expect(gz.body.toString()).toBe(text);
      // A reader who has the page is told it is unchanged.
      expect((await raw(app, path, 'br', { 'if-none-match': first.headers['etag']! })).status).toBe(304);
      // Renamed: a new page, with a new tag, for everyone.
      await t.database.db.execute(sql`update notebook set title = ${'Renamed finding'} where id = ${notebookId}`);
      const renamed = await raw(app, path, 'identity', { 'if-none-match': first.headers['etag']! });
      expect(renamed.status).toBe(200);
      expect(renamed.body.toString()).toContain('<title>Renamed finding · Cogbook</title>');
      expect(renamed.headers['etag']).not.toBe(first.headers['etag']);
    } finally {
      rmSync(join(root, 'dist', 'ssr'), { recursive: true, force: true });
    }
  });

  it('renders and compresses a page as it is published, so its first reader gets it ready', async () => {
    writeStandInRender(root);
    const renders = () => (globalThis as { standInRenders?: number }).standInRenders ?? 0;
    try {
      const { app } = t.appWith({ rootDir: root });
      const publisher = supertest.agent(app);
      await publisher.post('/api/auth/sign-in/email').send({ email: 'editor@lab.test', password: TEST_PASSWORD }).expect(200);
      const before = renders();
      const pub = (await publisher.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body as { slug: string };
      // No reader has asked yet: the page is rendered, and its compressed copy made, in the background.
      for (let i = 0; i < 200 && renders() === before; i++) await new Promise((r) => setTimeout(r, 20));
      expect(renders()).toBe(before + 1);
      await new Promise((r) => setTimeout(r, 200));
      const first = await raw(app, `/p/${pub.slug}`, 'br');
      expect(first.headers['content-encoding']).toBe('br');
      expect(brotliDecompressSync(first.body).toString()).toContain(`<div id="app" data-rendered="server"><article data-slug="${pub.slug}">`);
      expect(renders()).toBe(before + 1);
    } finally {
      rmSync(join(root, 'dist', 'ssr'), { recursive: true, force: true });
    }
  });

  it('does not hand a reader a render that began before the finding was withdrawn', async () => {
    writeStandInRender(root);
    const gate = globalThis as { standInGate?: Promise<void>; standInRenders?: number };
    let open!: () => void;
    gate.standInGate = new Promise((resolve) => (open = resolve));
    try {
      const { app } = t.appWith({ rootDir: root });
      const publisher = supertest.agent(app);
      await publisher.post('/api/auth/sign-in/email').send({ email: 'editor@lab.test', password: TEST_PASSWORD }).expect(200);
      const before = gate.standInRenders ?? 0;
      const pub = (await publisher.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body as { slug: string };
      // The render that publishing started is held at the gate; a reader arrives and waits for it.
      for (let i = 0; i < 200 && (gate.standInRenders ?? 0) === before; i++) await new Promise((r) => setTimeout(r, 20));
      const reading = raw(app, `/p/${pub.slug}`, 'identity');
      await new Promise((r) => setTimeout(r, 200));
      await publisher.delete(`/api/notebooks/${notebookId}/publication`).expect(204);
      open();
      const page = await reading;
      expect(page.status).toBe(200);
      expect(page.body.toString()).toContain('<div id="app"></div>');
      expect(page.body.toString()).not.toContain('data-rendered');
      expect(gate.standInRenders).toBe(before + 1);
    } finally {
      open();
      delete gate.standInGate;
      rmSync(join(root, 'dist', 'ssr'), { recursive: true, force: true });
    }
  });

  it('falls back to the app page when the client has no reader page', async () => {
    rmSync(join(root, 'dist', 'client', 'published.html'));
    try {
      const { app } = t.appWith({ rootDir: root });
      expect((await supertest(app).get('/p/chainring-gain-3f9a').expect(200)).text).toContain('<body>app</body>');
    } finally {
      writeFileSync(join(root, 'dist', 'client', 'published.html'), READER_HTML);
    }
  });

  it('compresses scripts with brotli or gzip as the browser accepts, and sends them plain otherwise', async () => {
    const { app } = t.appWith({ rootDir: root });
    const br = await raw(app, '/assets/published-abc.js', 'gzip, deflate, br');
    expect(br.status).toBe(200);
    expect(br.headers['content-encoding']).toBe('br');
    expect(br.headers['vary']).toMatch(/accept-encoding/i);
    expect(brotliDecompressSync(br.body).toString()).toBe(script);
    expect(br.body.length).toBeLessThan(script.length / 10);
    const gz = await raw(app, '/assets/published-abc.js', 'gzip');
    expect(gz.headers['content-encoding']).toBe('gzip');
    expect(gunzipSync(gz.body).toString()).toBe(script);
    const plain = await raw(app, '/assets/published-abc.js', 'identity');
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.body.toString()).toBe(script);
  });

  it('compresses the published snapshot, charts and all, and the reader page', async () => {
    const pub = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({}).expect(200)).body as { slug: string };
    const { app } = t.appWith({ rootDir: root });
    const res = await raw(app, `/api/published/${pub.slug}`, 'gzip');
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('gzip');
    const text = gunzipSync(res.body).toString();
    const page = publishedNotebookResponseSchema.parse(JSON.parse(text));
    expect(page.slug).toBe(pub.slug);
    expect(res.body.length).toBeLessThan(text.length / 3);
    const html = await raw(app, `/p/${pub.slug}`, 'br');
    expect(html.status).toBe(200);
    // The page itself is small: under the compression threshold it goes out as it is.
    expect(html.headers['content-encoding']).toBeUndefined();
    // Recording bytes are left alone (already dense; and a download keeps its exact length).
    const withFiles = (await editor.post(`/api/notebooks/${notebookId}/publication`).send({ allowDownloads: true }).expect(200)).body as { slug: string };
    const files = publishedNotebookResponseSchema.parse((await supertest(app).get(`/api/published/${withFiles.slug}`).expect(200)).body).files!;
    const file = await raw(app, `/api/published/${withFiles.slug}/files/${files[0]!.uploadId}`, 'gzip, br');
    expect(file.status).toBe(200);
    expect(file.headers['content-encoding']).toBeUndefined();
  });
});
