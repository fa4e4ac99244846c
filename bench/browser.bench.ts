import { existsSync } from 'node:fs';
import type { Browser, BrowserContext } from 'playwright-core';
import { launchBrowser } from '../tests/browser/support/browser.js';
import { startServer, type RunningServer } from '../tests/browser/support/server.js';
import { DEMO_PASSWORD } from '../tests/browser/support/session.js';
import { BenchApi } from './browser/api.js';
import { benchFiles, benchNotebook, tinyNotebook } from './browser/bench-notebook.js';
import { editOnce, editorReady, openNotebook, type OpenTiming } from './browser/notebook-page.js';
import { longTasksSupported, type EditTiming } from './browser/page-probe.js';
import { visitPublished, type PublishedVisit } from './browser/published-page.js';
import { ms, percentile } from './browser/stats.js';
import { repoPath } from './repo-path.js';
import { median } from './time-process.js';
import type { BenchOptions, BenchRow } from './types.js';

const ACCOUNT = 'analyst@ridgeline.test';
/** Cells of the benchmark notebook and of the baseline notebook (see bench-notebook.ts). */
const BIG_CELLS = 14;
const TINY_CELLS = 2;

interface Sizes {
  hours: number;
  opens: number;
  edits: number;
  visits: number;
}

/**
 * The product in headless Chromium, started from the build as `npm start` runs it: a notebook
 * of three recordings (reference and two devices under test) opened and edited, and its
 * published page read signed out. Every figure is taken in the page (navigation start and
 * key-press time stamps, DOM markers the pages set, 'longtask' entries), and its baseline is
 * the same thing done to a notebook with nothing to compute, in the same browser and run.
 */
export async function benchBrowser(options: BenchOptions): Promise<BenchRow[]> {
  return withProduct(options, (server, browser, sizes) => measure(server, browser, sizes));
}

/**
 * Only the published page's rows of {@link benchBrowser}: the 1 Hz notebook is uploaded and
 * published without opening or editing it, so the reader's figures come in minutes.
 */
export async function benchPublished(options: BenchOptions): Promise<BenchRow[]> {
  return withProduct(options, (server, browser, sizes) => measurePublished(server, browser, sizes));
}

/** Starts the built server and Chromium, runs `body`, and stops both whatever happens. */
async function withProduct(options: BenchOptions, body: (server: RunningServer, browser: Browser, sizes: Sizes) => Promise<BenchRow[]>): Promise<BenchRow[]> {
  const sizes: Sizes = options.quick ? { hours: 1, opens: 1, edits: 6, visits: 2 } : { hours: 4, opens: 3, edits: 21, visits: 5 };
  // The server support starts dist/node/server/index.js from the working directory.
  process.chdir(repoPath(''));
  await builtClient();
  const seeded = process.env['COGBOOK_BROWSER_DATA_DIR'];
  // Seeding the demo lab at a first start takes minutes on a busy machine (COGBOOK_BROWSER_DATA_DIR: a seeded copy).
  log('starting the server (a first start seeds the demo lab) and Chromium');
  const started = await Promise.allSettled([startServer(seeded ? { DATA_DIR: seeded } : {}, { readyWithinMs: 10 * 60_000 }), launchBrowser()]);
  const [serverStart, browserStart] = started;
  if (serverStart.status === 'rejected' || browserStart.status === 'rejected') {
    // Whichever did start must stop, or its process keeps this one alive.
    if (serverStart.status === 'fulfilled') await serverStart.value.stop();
    if (browserStart.status === 'fulfilled') await browserStart.value.close();
    throw serverStart.status === 'rejected' ? serverStart.reason : (browserStart as PromiseRejectedResult).reason;
  }
  const server = serverStart.value;
  const browser = browserStart.value;
  try {
    return await body(server, browser, sizes);
  } catch (error) {
    const tail = server.output().trim().split('\n').slice(-5).join(' | ');
    throw new Error(`${error instanceof Error ? error.message : String(error)}${tail ? ` (server: ${tail})` : ''}`);
  } finally {
    await browser.close();
    await server.stop();
  }
}

/** The analyst's signed-in context, API helper, workspace and the baseline notebook both measurements start from. */
async function signedInOwner(server: RunningServer, browser: Browser) {
  const owner = await browser.newContext({ viewport: { width: 1280, height: 860 } });
  owner.setDefaultTimeout(120_000);
  const api = new BenchApi(owner.request, server.url);
  await api.signIn(ACCOUNT, DEMO_PASSWORD);
  const workspaceId = await api.workspaceId();
  const tiny = await api.createNotebook(workspaceId, tinyNotebook('Benchmark baseline'));
  return { owner, api, workspaceId, tiny };
}

async function measure(server: RunningServer, browser: Browser, sizes: Sizes): Promise<BenchRow[]> {
  const { owner, api, workspaceId, tiny } = await signedInOwner(server, browser);
  const rows: BenchRow[] = [];
  let publishedBig: { id: string; label: string } | undefined;
  for (const rateHz of [1, 10] as const) {
    const label = `3 x ${sizes.hours} h ${rateHz} Hz`;
    log(`${label}: writing and uploading the recordings`);
    const files = benchFiles(sizes.hours, rateHz);
    const uploads = await api.upload(files);
    const big = await api.createNotebook(workspaceId, benchNotebook(`Benchmark ${label}`, uploads));
    const mb = files.reduce((s, f) => s + f.bytes.length, 0) / 1e6;
    rows.push(...(await notebookRows(owner, server.url, { big: big.notebook.id, tiny: tiny.notebook.id }, `${label} (${mb.toFixed(1)} MB)`, sizes)));
    if (rateHz === 1) publishedBig = { id: big.notebook.id, label };
  }
  log('publishing (the server computes the snapshots)');
  const bigSlug = (await api.publish(publishedBig!.id)).slug;
  const tinySlug = (await api.publish(tiny.notebook.id)).slug;
  rows.push(...(await publishedRows(browser, server.url, { big: bigSlug, tiny: tinySlug }, publishedBig!.label, sizes)));
  await owner.close();
  return rows;
}

async function measurePublished(server: RunningServer, browser: Browser, sizes: Sizes): Promise<BenchRow[]> {
  const { owner, api, workspaceId, tiny } = await signedInOwner(server, browser);
  const label = `3 x ${sizes.hours} h 1 Hz`;
  log(`${label}: writing and uploading the recordings`);
  const big = await api.createNotebook(workspaceId, benchNotebook(`Benchmark ${label}`, await api.upload(benchFiles(sizes.hours, 1))));
  log('publishing (the server computes the snapshots)');
  const bigSlug = (await api.publish(big.notebook.id)).slug;
  const tinySlug = (await api.publish(tiny.notebook.id)).slug;
  const rows = await publishedRows(browser, server.url, { big: bigSlug, tiny: tinySlug }, label, sizes);
  await owner.close();
  return rows;
}

/** Opens (a), edits (b) and the longest task while recomputing (c), against the baseline notebook. */
async function notebookRows(owner: BrowserContext, baseUrl: string, ids: { big: string; tiny: string }, label: string, sizes: Sizes): Promise<BenchRow[]> {
  // One signed-in context for the pages, sharing the browser cache as a returning user's tab would.
  const context = await owner.browser()!.newContext({ viewport: { width: 1280, height: 860 }, storageState: await owner.storageState() });
  context.setDefaultTimeout(120_000);
  try {
    const url = (id: string) => `${baseUrl}/notebooks/${id}`;
    const opens = { big: [] as OpenTiming[], tiny: [] as OpenTiming[] };
    // The first open of each is cold (scripts and recordings not cached yet) and kept apart.
    let cold: OpenTiming | undefined;
    let pages = { big: undefined as Awaited<ReturnType<typeof openNotebook>>['page'] | undefined, tiny: undefined as Awaited<ReturnType<typeof openNotebook>>['page'] | undefined };
    for (let k = 0; k <= sizes.opens; k++) {
      for (const which of k % 2 === 0 ? (['big', 'tiny'] as const) : (['tiny', 'big'] as const)) {
        log(`${label}: open ${which} ${k === 0 ? '(cold)' : k}`);
        const { page, timing } = await openNotebook(context, url(ids[which]), which === 'big' ? BIG_CELLS : TINY_CELLS);
        if (k === 0 && which === 'big') cold = timing;
        else if (k > 0) opens[which].push(timing);
        await pages[which]?.close();
        pages[which] = page;
      }
    }
    await Promise.all([editorReady(pages.big!), editorReady(pages.tiny!)]);
    const longTasks = await longTasksSupported(pages.big!);
    const edits = { big: { run: [] as EditTiming[], typed: [] as EditTiming[] }, tiny: { run: [] as EditTiming[], typed: [] as EditTiming[] } };
    log(`${label}: ${sizes.edits} edits x 2 ways x 2 notebooks`);
    // The digit each page's formula holds now (`pedal_min = 5`); the next is always another, so every press changes it.
    const current = { big: 5, tiny: 5 };
    const nextDigit = (which: 'big' | 'tiny') => String((current[which] = (current[which] % 9) + 1));
    for (let i = 0; i < sizes.edits; i++) {
      for (const which of i % 2 === 0 ? (['big', 'tiny'] as const) : (['tiny', 'big'] as const)) {
        edits[which].run.push(await editOnce(pages[which]!, nextDigit(which), true));
        edits[which].typed.push(await editOnce(pages[which]!, nextDigit(which), false));
      }
    }
    const openMs = (xs: OpenTiming[]) => median(xs.map((x) => x.ms));
    const p = (xs: EditTiming[], q: number) => percentile(xs.map((x) => x.ms), q);
    const maxOf = (xs: EditTiming[], f: (x: EditTiming) => number) => Math.max(0, ...xs.map(f));
    const allEdits = (w: 'big' | 'tiny') => [...edits[w].run, ...edits[w].typed];
    const bigOpenTask = Math.max(0, ...opens.big.map((o) => o.longestTaskMs));
    const tinyOpenTask = Math.max(0, ...opens.tiny.map((o) => o.longestTaskMs));
    const n = sizes.edits;
    const row = (name: string, value: number, baseline: number, note: string): BenchRow => ({ name, value, unit: 'ms', baseline, ratio: value / baseline, note });
    const taskBig = maxOf(allEdits('big'), (x) => x.longestTaskMs);
    const taskTiny = maxOf(allEdits('tiny'), (x) => x.longestTaskMs);
    return [
      row(
        `browser: open notebook ${label}, ${BIG_CELLS} cells`,
        openMs(opens.big),
        openMs(opens.tiny),
        `navigation start -> every cell up to date and every chart drawn; baseline: the same for a ${TINY_CELLS}-cell notebook without recordings; median of ${sizes.opens} warm-cache opens (first, cold: ${ms(cold?.ms ?? NaN)}); longest task while opening ${ms(bigOpenTask)} (baseline ${ms(tinyOpenTask)})`,
      ),
      row(
        `browser: edit formula -> output p50, Shift+Enter, ${label}`,
        p(edits.big.run, 50),
        p(edits.tiny.run, 50),
        `one digit changed in the code editor, then Shift+Enter: that press -> the cell's new output in the page (recompute in the worker + render); from the digit's own press ${ms(percentile(edits.big.run.map((x) => x.fromTypedMs), 50))} (includes the harness sending Shift+Enter); baseline: the same edit in a notebook with nothing else to compute; ${n} edits each, interleaved`,
      ),
      row(
        `browser: edit formula -> output p95, Shift+Enter, ${label}`,
        p(edits.big.run, 95),
        p(edits.tiny.run, 95),
        `as above, 95th percentile of ${n}; target < 100 ms; baseline: the nothing-to-compute notebook's p95`,
      ),
      row(
        `browser: edit formula -> output p50, typing, ${label}`,
        p(edits.big.typed, 50),
        p(edits.tiny.typed, 50),
        `as above without Shift+Enter: the notebook runs by itself 250 ms after the last key, so both include that pause; p95 ${ms(p(edits.big.typed, 95))} (baseline ${ms(p(edits.tiny.typed, 95))}); ${n} edits each`,
      ),
      row(
        `browser: longest main-thread task while recomputing, ${label}`,
        taskBig,
        taskTiny,
        `${longTasks ? '' : 'NOT MEASURED: this Chromium reports no longtask entries; '}'longtask' entries from the digit's key press to the output over all ${2 * n} edits (0 = none of 50 ms or more, the shortest the browser reports); target < 50 ms; baseline: the same edits in the nothing-to-compute notebook${taskTiny === 0 ? ' (none, so no ratio)' : ''}; longest gap between frames ${ms(maxOf(allEdits('big'), (x) => x.longestFrameGapMs))} (baseline ${ms(maxOf(allEdits('tiny'), (x) => x.longestFrameGapMs))})`,
      ),
    ];
  } finally {
    await context.close();
  }
}

/** First render of the published page, signed out, against the published baseline notebook. */
async function publishedRows(browser: Browser, baseUrl: string, slugs: { big: string; tiny: string }, label: string, sizes: Sizes): Promise<BenchRow[]> {
  const visits = { big: [] as PublishedVisit[], tiny: [] as PublishedVisit[] };
  for (let k = 0; k < sizes.visits; k++) {
    for (const which of k % 2 === 0 ? (['big', 'tiny'] as const) : (['tiny', 'big'] as const)) {
      log(`published ${which} visit ${k + 1}`);
      visits[which].push(await visitPublished(browser, baseUrl, slugs[which], which === 'big' ? 'firstChart' : 'firstValue'));
    }
  }
  const fetched = [...visits.big, ...visits.tiny].flatMap((v) => v.recordingRequests);
  if (fetched.length > 0) throw new Error(`the published page downloaded raw recordings: ${[...new Set(fetched)].join(', ')}`);
  const med = (xs: PublishedVisit[], f: (v: PublishedVisit) => number | undefined) => median(xs.map((v) => f(v) ?? NaN));
  const big = { chart: med(visits.big, (v) => v.marks.firstChart), value: med(visits.big, (v) => v.marks.firstValue), fcp: med(visits.big, (v) => v.marks.fcp), bytes: med(visits.big, (v) => v.bytes) };
  const tiny = { value: med(visits.tiny, (v) => v.marks.firstValue), fcp: med(visits.tiny, (v) => v.marks.fcp), bytes: med(visits.tiny, (v) => v.bytes) };
  const requests = visits.big[0]?.requests ?? 0;
  return [
    {
      name: `browser: published page ${label}, first chart drawn`,
      value: big.chart,
      unit: 'ms',
      baseline: tiny.value,
      ratio: big.chart / tiny.value,
      note: `signed out, empty cache: navigation start -> first chart drawn (first number at ${ms(big.value)}); baseline: first number of the published ${TINY_CELLS}-cell notebook without recordings; median of ${sizes.visits}`,
    },
    {
      name: `browser: published page ${label}, first contentful paint`,
      value: big.fcp,
      unit: 'ms',
      baseline: tiny.fcp,
      ratio: big.fcp / tiny.fcp,
      note: `'first-contentful-paint' entry; baseline: the same for the published baseline notebook; median of ${sizes.visits}`,
    },
    {
      name: `browser: published page ${label}, bytes received`,
      value: big.bytes / 1000,
      unit: 'kB',
      baseline: tiny.bytes / 1000,
      ratio: big.bytes / tiny.bytes,
      note: `headers + encoded bodies of all ${requests} requests up to network idle; checked: no request for a recording (uploads, /content, published files) in ${2 * sizes.visits} visits; baseline: the published baseline notebook`,
    },
  ];
}

/** Waits a while for dist/client: a `vite build` under way (another terminal) empties it first. */
async function builtClient(): Promise<void> {
  const deadline = Date.now() + 5 * 60_000;
  while (!existsSync(repoPath('dist/client/index.html'))) {
    if (Date.now() > deadline) throw new Error('no built client: run npm run build first');
    await new Promise((r) => setTimeout(r, 2000));
  }
}

function log(message: string): void {
  process.stderr.write(`  ${message}\n`);
}
