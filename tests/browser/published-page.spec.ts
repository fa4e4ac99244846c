import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';
import type { Browser, Response } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { PublishedListResponse, PublishedNotebookResponse } from '../../shared/api/publications.js';
import { DEMO_PUBLISHED_NOTEBOOK } from '../../shared/demo/sample-files.js';
import { launchBrowser, watchedPage } from './support/browser.js';
import { startServer, type RunningServer } from './support/server.js';

const CLIENT = join(import.meta.dirname, '..', '..', 'dist', 'client');

/** Modules a reader's page must not load before a reader asks for something: the editor, the engine, the app's shell and kit, the chart library. */
const NOT_FOR_READERS = /monaco-editor|\/workers\/|engine\.worker|NotebookView|ant-design-vue|@ant-design\/icons-vue|vega|@tanstack|pinia|vue-router|\/zod\/|mathjs|arquero|better-auth/;

/** published.html's entry script. */
function entryScript(): string {
  const html = readFileSync(join(CLIENT, 'published.html'), 'utf8');
  const entries = [...html.matchAll(/<script type="module" crossorigin src="\/assets\/([^"]+\.js)"/g)].map((m) => m[1]!);
  expect(entries, 'published.html has its own entry script').toHaveLength(1);
  return entries[0]!;
}

/** `files` and what they import statically (not `import()`). */
function withStaticImports(files: string[]): string[] {
  const seen = new Set<string>();
  const queue = [...files];
  while (queue.length > 0) {
    const file = queue.pop()!;
    if (seen.has(file)) continue;
    seen.add(file);
    const code = readFileSync(join(CLIENT, 'assets', file), 'utf8');
    for (const m of code.matchAll(/\bfrom\s*"\.\/([^"]+\.js)"|\bimport\s*"\.\/([^"]+\.js)"/g)) queue.push(m[1] ?? m[2]!);
  }
  return [...seen];
}

/** The bundler's own helpers (module preloading, its runtime): generated code, with no source map. */
const BUNDLER_HELPER = /^(preload-helper|rolldown-runtime)-[\w-]+\.js$/;

/** The modules (source paths) bundled into `files`, from their source maps; every chunk but the bundler's own helpers has one. */
function modulesOf(files: string[]): string[] {
  const mapped = files.filter((f) => existsSync(join(CLIENT, 'assets', `${f}.map`)));
  expect(files.filter((f) => !mapped.includes(f) && !BUNDLER_HELPER.test(f))).toEqual([]);
  return mapped.flatMap((f) => (JSON.parse(readFileSync(join(CLIENT, 'assets', `${f}.map`), 'utf8')) as { sources: string[] }).sources);
}

const gzippedSize = (files: string[]) => files.reduce((sum, f) => sum + gzipSync(readFileSync(join(CLIENT, 'assets', f))).length, 0);

describe('the published page as built', () => {
  it('runs almost no script before the first paint, then loads the reader view alone: no editor, engine, app shell, UI kit or chart library', () => {
    const entry = entryScript();
    // Before the first paint: the entry and its static imports only, a few kB without the framework.
    const first = withStaticImports([entry]);
    expect(modulesOf(first).some((m) => m.includes('node_modules/@vue/'))).toBe(false);
    expect(gzippedSize(first)).toBeLessThan(5_000);
    // After it: the view the entry imports, and what that imports statically.
    const code = readFileSync(join(CLIENT, 'assets', entry), 'utf8');
    const later = [...code.matchAll(/\bimport\(\s*[`"']\.\/([^`"']+\.js)[`"']\s*\)/g)].map((m) => m[1]!);
    expect(later, 'the entry loads the view by a dynamic import').toHaveLength(1);
    const view = withStaticImports(later);
    const modules = modulesOf(view);
    expect(modules.some((m) => m.includes('src/views/PublishedView.vue')), 'the reader view is in the page').toBe(true);
    expect(modules.some((m) => m.includes('node_modules/@vue/runtime-core')), 'the framework is in the page').toBe(true);
    expect(modulesOf([...first, ...view]).filter((m) => NOT_FOR_READERS.test(m))).toEqual([]);
    // A budget, not a timing: every script the page loads unasked, compressed as the server sends it.
    expect(gzippedSize([...new Set([...first, ...view])])).toBeLessThan(100_000);
  });
});

describe('a signed-out reader on the published page', () => {
  let server: RunningServer;
  let browser: Browser;
  let slug: string;
  let stored: PublishedNotebookResponse;

  beforeAll(async () => {
    [server, browser] = await Promise.all([startServer({}, { readyWithinMs: 240_000 }), launchBrowser()]);
    const list = (await (await fetch(`${server.url}/api/published`)).json()) as PublishedListResponse;
    slug = list.publications.find((p) => p.title === DEMO_PUBLISHED_NOTEBOOK.title)!.slug;
    stored = (await (await fetch(`${server.url}/api/published/${slug}`)).json()) as PublishedNotebookResponse;
  }, 300_000);

  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });

  it('gets every chart drawn by the server, its snapshot from the preload, everything compressed, and no policy report', { timeout: 120_000 }, async () => {
    const charts = stored.snapshot.cells.filter((c) => c.result?.type === 'chart');
    expect(charts.length).toBeGreaterThan(0);
    expect(charts.every((c) => c.result?.type === 'chart' && c.result.svg?.startsWith('<svg')), 'the demo was published with drawn charts').toBe(true);

    const w = await watchedPage(browser, { width: 1280, height: 860 });
    const responses: Response[] = [];
    w.page.on('response', (r) => responses.push(r));
    try {
      await w.page.goto(`${server.url}/p/${slug}`);
      await w.page.getByTestId('published-article').waitFor();
      const frames = w.page.locator('[data-kind=chart] .chart-view');
      expect(await frames.count()).toBe(charts.length);
      expect(await frames.evaluateAll((fs) => fs.map((f) => `${(f as HTMLElement).dataset['ready']}/${(f as HTMLElement).dataset['drawn']}`))).toEqual(charts.map(() => 'true/server'));
      expect(await w.page.locator('[data-kind=chart] .chart-view__canvas svg.marks').count()).toBe(charts.length);
      await w.page.waitForLoadState('networkidle');

      const paths = responses.map((r) => new URL(r.url()).pathname);
      // One snapshot request, started by the page's preload link and handed to the page's own fetch.
      expect(paths.filter((p) => p === `/api/published/${slug}`)).toHaveLength(1);
      const initiator = await w.page.evaluate((s) => performance.getEntriesByType('resource').filter((e) => e.name.endsWith(`/api/published/${s}`)).map((e) => (e as PerformanceResourceTiming).initiatorType), slug);
      expect(initiator).toEqual(['link']);
      // Neither the chart library nor the editor came along.
      expect(paths.filter((p) => /embed|vega|monaco|editor|engine\.worker|NotebookView/.test(p))).toEqual([]);
      // Every style sheet is in the page itself, and the view's scripts were asked for only once the finding was painted.
      expect(paths.filter((p) => p.endsWith('.css'))).toEqual([]);
      const order = await w.page.evaluate(() => ({
        painted: performance.getEntriesByName('cogbook:reader-painted')[0]?.startTime ?? Infinity,
        view: performance.getEntriesByType('resource').filter((e) => /\/assets\/published-app-[\w-]+\.js$/.test(e.name)).map((e) => e.startTime),
      }));
      expect(order.view).toHaveLength(1);
      expect(order.view[0]).toBeGreaterThanOrEqual(order.painted);
      // Scripts, styles and the snapshot arrive compressed (all but the few under the 1 kB threshold, where it gains nothing).
      const textual = responses.filter((r) => /\.(js|css)$|^\/api\/published\//.test(new URL(r.url()).pathname) && r.status() === 200);
      const sent = await Promise.all(textual.map(async (r) => ({ path: new URL(r.url()).pathname, encoding: (await r.allHeaders())['content-encoding'], size: (await r.body()).length })));
      expect(sent.filter((r) => r.size > 1024).length).toBeGreaterThan(3);
      expect(sent.filter((r) => r.size > 1024 && !/^(br|gzip)$/.test(r.encoding ?? ''))).toEqual([]);
      expect(w.problems).toEqual([]);
    } finally {
      await w.context.close();
    }
  });

  it('has the finding, charts drawn, in the HTML itself: readable before (and without) any script', { timeout: 120_000 }, async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 }, javaScriptEnabled: false });
    try {
      const page = await context.newPage();
      await page.goto(`${server.url}/p/${slug}`);
      expect(await page.title()).toBe(`${stored.title} · Cogbook`);
      expect(await page.locator('h1').first().textContent()).toBe(stored.title);
      expect(await page.locator('[data-snapshot-cell]').evaluateAll((els) => els.map((e) => (e as HTMLElement).dataset['snapshotCell']))).toEqual(stored.snapshot.cells.map((c) => c.name));
      const charts = stored.snapshot.cells.filter((c) => c.result?.type === 'chart').length;
      expect(await page.locator('[data-kind=chart] .chart-view[data-ready=true] .chart-view__canvas svg.marks').count()).toBe(charts);
      // Drawn, not just present: each chart has its size on the page.
      const sizes = await page.locator('[data-kind=chart] svg.marks').evaluateAll((svgs) => svgs.map((s) => s.getBoundingClientRect().width));
      expect(sizes.every((w) => w > 300)).toBe(true);
    } finally {
      await context.close();
    }
  });

  it('takes the server\'s markup over in any time zone without a mismatch, and then answers clicks', { timeout: 120_000 }, async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 }, timezoneId: 'Pacific/Auckland' });
    const problems: string[] = [];
    try {
      const page = await context.newPage();
      page.on('console', (m) => (m.type() === 'error' || m.type() === 'warning') && problems.push(m.text()));
      page.on('pageerror', (e) => problems.push(e.message));
      await page.goto(`${server.url}/p/${slug}`);
      await page.waitForFunction(() => !!(document.getElementById('app') as { __vue_app__?: unknown } | null)?.__vue_app__);
      // The date in the reader's own time zone (the server wrote it in its own).
      const shown = await page.locator('.published__byline time').textContent();
      expect(shown).toBe(new Intl.DateTimeFormat('en-GB', { dateStyle: 'medium', timeStyle: 'short', timeZone: 'Pacific/Auckland' }).format(Date.parse(stored.publishedAt)));
      await page.locator('button[aria-label="Export chart"]').first().click();
      expect(await page.getByRole('menuitem').allTextContents()).toEqual(['Picture (PNG)', 'Vector drawing (SVG)', 'Chart data (CSV)']);
      const download = page.waitForEvent('download');
      await page.getByRole('menuitem', { name: 'Vector drawing (SVG)' }).click();
      expect((await download).suggestedFilename()).toMatch(/\.svg$/);
      expect(problems).toEqual([]);
    } finally {
      await context.close();
    }
  });

  it('has nothing axe finds serious, server drawings included, and lays out a drawing only when near the screen', { timeout: 120_000 }, async () => {
    const w = await watchedPage(browser, { width: 1280, height: 860 });
    try {
      await w.page.goto(`${server.url}/p/${slug}`);
      await w.page.waitForFunction(() => !!(document.getElementById('app') as { __vue_app__?: unknown } | null)?.__vue_app__);
      expect(await w.page.locator('.chart-view__canvas svg.marks').count()).toBeGreaterThan(0);
      // axe goes in through the DevTools protocol, which the page's policy does not govern.
      await w.page.evaluate(readFileSync('node_modules/axe-core/axe.min.js', 'utf8'));
      const findings = await w.page.evaluate<{ id: string; impact: string | null; targets: string[] }[]>(
        `axe.run(document, { resultTypes: ['violations'] }).then((r) => r.violations.map((v) => ({ id: v.id, impact: v.impact, targets: v.nodes.map((n) => n.target.join(' ')) })))`,
      );
      expect(findings.filter((f) => f.impact === 'serious' || f.impact === 'critical')).toEqual([]);
      expect(await w.page.locator('.chart-view__canvas').evaluateAll((els) => els.map((e) => getComputedStyle(e).contentVisibility))).toEqual(
        Array.from({ length: await w.page.locator('.chart-view__canvas').count() }, () => 'auto'),
      );
      expect(w.problems).toEqual([]);
    } finally {
      await w.context.close();
    }
  });

  it('prints on A4 with the charts scaled to the paper and no page chrome', { timeout: 120_000 }, async () => {
    const w = await watchedPage(browser, { width: 1280, height: 860 });
    try {
      await w.page.goto(`${server.url}/p/${slug}`);
      await w.page.getByTestId('published-article').waitFor();
      await w.page.emulateMedia({ media: 'print' });
      // An A4 page's printable width at 96 dpi (210 mm less the page's 16 mm margins).
      await w.page.setViewportSize({ width: 673, height: 950 });
      const layout = await w.page.evaluate(() => ({
        chrome: [...document.querySelectorAll('.published__bar, .chart-view__actions, .snapshot__toc')].map((e) => getComputedStyle(e).display),
        // On screen a drawing far down the page waits to be drawn until scrolled to; on paper every one is drawn.
        skipped: [...document.querySelectorAll('.chart-view__canvas')].map((e) => getComputedStyle(e).contentVisibility),
        charts: [...document.querySelectorAll('.chart-view__canvas svg.marks')].map((s) => [s.getBoundingClientRect().width, s.closest('.chart-view')!.getBoundingClientRect().width]),
      }));
      expect(layout.chrome.length).toBeGreaterThan(1);
      expect(layout.chrome.every((d) => d === 'none')).toBe(true);
      expect(layout.charts.length).toBeGreaterThan(0);
      expect(layout.skipped).toEqual(layout.charts.map(() => 'visible'));
      for (const [svg, frame] of layout.charts) {
        expect(svg).toBeGreaterThan(300);
        expect(svg).toBeLessThanOrEqual(frame! + 0.5);
      }
      const pdf = await w.page.pdf({ format: 'A4', printBackground: true });
      expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
      expect(w.problems).toEqual([]);
    } finally {
      await w.context.close();
    }
  });
});
