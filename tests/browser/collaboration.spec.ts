import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { NotebookListResponse, NotebookResponse } from '../../shared/api/notebooks.js';
import type { PublishedListResponse, PublishedNotebookResponse } from '../../shared/api/publications.js';
import { DEMO_PUBLISHED_NOTEBOOK } from '../../shared/demo/sample-files.js';
import { DEMO_SCENARIOS } from '../../shared/demo/scenarios.js';
import { writeFit } from '../../shared/recording/write-fit.js';
import { deviceView } from '../../shared/synthetic/device-view.js';
import { synthesizeRide } from '../../shared/synthetic/synthesize-ride.js';
import { launchBrowser, watchedPage, type WatchedPage } from './support/browser.js';
import { startServer, type RunningServer } from './support/server.js';
import { signInAs } from './support/session.js';
import { until as untilHolds } from './support/until.js';

// The recipe is the seeded chainring notebook: its own ride has the left leg of the test
// crank reading 8% high on the 50T (the scenario's built-in error). The second ride is
// generated here with a different seed and a left-leg error of 3% on the 50T, as after a
// firmware change, so the two runs must show clearly different left-leg numbers.
const scenario = DEMO_SCENARIOS['chainring-gain'];
const SECOND_RIDE_LEFT_GAIN_50T = 1.03;

let server: RunningServer;
let browser: Browser;
let dir: string;
const files = { reference: '', test: '' };
/** Shared between the stories, in order: the recipe the analyst re-runs and shares. */
const story = { notebookId: '', shareUrl: '', revisionBeforeFork: 0 };

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'cogbook-collab-'));
  const ride = synthesizeRide({ ...scenario.ride, seed: 20260316, startMs: Date.UTC(2026, 2, 16, 9, 0, 0) });
  const models = {
    reference: scenario.reference.model,
    test: { ...scenario.test.model, gains: { left: [1, SECOND_RIDE_LEFT_GAIN_50T], right: [1, 1] } },
  };
  files.reference = join(dir, 'mara-2026-03-16-mossgate-r1-reference.fit');
  files.test = join(dir, 'mara-2026-03-16-thimble-dx-crank-fw2.fit');
  writeFileSync(files.reference, writeFit(deviceView(ride, models.reference).recording));
  writeFileSync(files.test, writeFit(deviceView(ride, models.test).recording));
  [server, browser] = await Promise.all([startServer({}, { readyWithinMs: 240_000 }), launchBrowser()]);
}, 300_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  rmSync(dir, { recursive: true, force: true });
});

/** The collaboration stories run several servers' worth of work: a longer default wait. */
const until = (what: string, check: () => Promise<boolean>, timeoutMs = 90_000): Promise<void> => untilHolds(what, check, timeoutMs, 200);

/** With COGBOOK_SHOTS=dir, a picture of the page for a human to look at. */
async function shot(page: Page, name: string): Promise<void> {
  const out = process.env['COGBOOK_SHOTS'];
  if (!out) return;
  mkdirSync(out, { recursive: true });
  await page.screenshot({ path: join(out, `${name}.png`) });
}

async function chartsReady(page: Page): Promise<boolean> {
  return page.evaluate(() => [...document.querySelectorAll<HTMLElement>('.chart-view')].every((f) => f.dataset['ready'] === 'true'));
}

async function openDemoNotebook(w: WatchedPage): Promise<void> {
  const list = (await (await w.page.request.get(`${server.url}/api/notebooks`)).json()) as NotebookListResponse;
  const demo = list.notebooks.find((n) => n.title === scenario.title);
  expect(demo, 'the seeded chainring notebook').toBeDefined();
  story.notebookId = demo!.id;
  await w.page.goto(`${server.url}/notebooks/${demo!.id}`);
  await w.page.getByTestId('open-runs').waitFor();
}

async function startRun(page: Page, label: string, expectedRuns: number): Promise<void> {
  await page.getByLabel('Run label').fill(label);
  await page.getByTestId('start-run').click();
  await until(`${expectedRuns} runs listed`, async () => (await page.locator('tr[data-run-id]').count()) === expectedRuns, 180_000);
}

describe('working together on a notebook', () => {
  it('the analyst re-runs the recipe on two new files and compares the runs', { timeout: 420_000 }, async () => {
    const w = await watchedPage(browser, { width: 1280, height: 860 });
    try {
      await signInAs(w.page, server.url, 'analyst@ridgeline.test');
      await openDemoNotebook(w);
      await w.page.getByTestId('open-runs').click();
      await w.page.getByText('No runs yet.').waitFor();

      // First run: the notebook's own recordings.
      await startRun(w.page, 'Original ride', 1);

      // Second run: two new files uploaded from the page into the two inputs.
      for (const slot of ['reference', 'test'] as const) {
        await w.page.locator(`[data-run-slot="${slot}"] input[type=file]`).setInputFiles(files[slot]);
        const name = files[slot].split('/').pop()!;
        await until(`${name} chosen for ${slot}`, async () => (await w.page.locator(`[data-run-slot="${slot}"] .ant-select-selection-item`).textContent())?.trim() === name);
      }
      await startRun(w.page, 'Second ride, firmware 2', 2);

      const rows = w.page.locator('tr[data-run-id]');
      expect(await rows.nth(0).textContent()).toContain('Second ride, firmware 2');
      expect(await rows.nth(0).textContent()).toContain('mara-2026-03-16-thimble-dx-crank-fw2.fit');
      expect(await rows.nth(1).textContent()).toContain('Original ride');
      expect(await rows.nth(1).textContent()).toContain(scenario.test.fileName);

      // Compare the left leg on the big chainring across the two runs.
      await w.page.locator('#run-compare-path').click();
      await w.page.locator('#run-compare-path').fill('legs.left_big');
      await w.page.keyboard.press('Enter');
      const table = w.page.getByTestId('run-compare-table');
      await table.waitFor();
      const values = await table.locator('td[data-value]').evaluateAll((tds) => tds.map((td) => Number((td as HTMLElement).dataset['value'])));
      expect(values).toHaveLength(2);
      // Oldest first: the demo ride's +8% (scenario truth), then this ride's +3% (set above).
      expect(values[0]).toBeGreaterThan(7);
      expect(values[0]).toBeLessThan(9);
      expect(values[1]).toBeGreaterThan(2);
      expect(values[1]).toBeLessThan(4);
      await until('comparison chart drawn', async () => (await w.page.locator('.run-compare__chart .chart-view[data-ready=true] svg.marks').count()) === 1);
      await shot(w.page, 'run-comparison-1280');
      await w.page.setViewportSize({ width: 1024, height: 800 });
      await shot(w.page, 'run-comparison-1024');
      await w.page.setViewportSize({ width: 1280, height: 860 });
      await w.page.keyboard.press('Escape');

      // A read-only link for the collaborator.
      await w.page.getByTestId('open-share').click();
      await w.page.getByRole('button', { name: 'Make a link' }).click();
      const address = w.page.getByLabel('Link address').first();
      await address.waitFor();
      story.shareUrl = await address.inputValue();
      expect(story.shareUrl).toMatch(/\/(s|shared)\/[A-Za-z0-9_-]{16,64}$/);
      await shot(w.page, 'share-dialog-1280');
      await w.page.setViewportSize({ width: 1024, height: 800 });
      await shot(w.page, 'share-dialog-1024');

      const original = (await (await w.page.request.get(`${server.url}/api/notebooks/${story.notebookId}`)).json()) as NotebookResponse;
      story.revisionBeforeFork = original.revision;
      expect(w.problems).toEqual([]);
    } finally {
      await w.context.close();
    }
  });

  it('a colleague copies it from the share link and changes the copy, not the original', { timeout: 300_000 }, async () => {
    expect(story.shareUrl, 'the first story made a share link').not.toBe('');
    const w = await watchedPage(browser, { width: 1280, height: 860 });
    try {
      await signInAs(w.page, server.url, 'viewer@ridgeline.test');
      await w.page.goto(story.shareUrl);
      await w.page.getByRole('heading', { name: scenario.title }).waitFor();
      // The share page shows stored results, drawn as charts.
      await until('shared charts drawn', () => chartsReady(w.page));

      await w.page.getByRole('button', { name: 'Make my own copy' }).click();
      await w.page.getByRole('button', { name: 'Make the copy' }).click();
      await w.page.waitForURL(/\/notebooks\/[^/]+$/);
      const copyId = w.page.url().split('/').pop()!;
      expect(copyId).not.toBe(story.notebookId);
      const provenance = w.page.getByTestId('provenance');
      await provenance.waitFor();
      expect(await provenance.textContent()).toContain(`Copied from ${scenario.title}, revision ${story.revisionBeforeFork}`);

      // Change the copy: a new title, saved as its revision 2.
      await w.page.locator('.nb-toolbar__heading').click();
      const title = w.page.getByLabel('Notebook title');
      await title.fill('My variation on the chainring ride');
      await title.press('Enter');
      await until('the copy saved', async () => (await w.page.getByTestId('save-state').getAttribute('data-save-state')) === 'saved' && (await w.page.getByTestId('save-state').textContent())!.includes('revision 2'));

      const copy = (await (await w.page.request.get(`${server.url}/api/notebooks/${copyId}`)).json()) as NotebookResponse;
      expect(copy.document.title).toBe('My variation on the chainring ride');
      expect(copy.notebook.forkedFrom).toMatchObject({ notebookId: story.notebookId, revision: story.revisionBeforeFork, title: scenario.title });
      const original = (await (await w.page.request.get(`${server.url}/api/notebooks/${story.notebookId}`)).json()) as NotebookResponse;
      expect(original.revision).toBe(story.revisionBeforeFork);
      expect(original.document.title).toBe(scenario.title);
      expect(w.problems).toEqual([]);
    } finally {
      await w.context.close();
    }
  });

  it('a signed-out reader reads the published demo: every chart and number, nothing to edit, no editor loaded', { timeout: 180_000 }, async () => {
    const w = await watchedPage(browser, { width: 1280, height: 800 });
    const requested: string[] = [];
    w.page.on('request', (r) => requested.push(r.url()));
    try {
      const list = (await (await w.page.request.get(`${server.url}/api/published`)).json()) as PublishedListResponse;
      const demo = list.publications.find((p) => p.title === DEMO_PUBLISHED_NOTEBOOK.title);
      expect(demo, 'the demo finding is published at first start').toBeDefined();
      const stored = (await (await w.page.request.get(`${server.url}/api/published/${demo!.slug}`)).json()) as PublishedNotebookResponse;

      await w.page.goto(`${server.url}/p/${demo!.slug}`);
      await w.page.getByTestId('published-article').waitFor();
      await until('every chart drawn', () => chartsReady(w.page));

      expect(await w.page.locator('h1').first().textContent()).toBe(stored.title);
      expect(await w.page.locator('.published__byline').textContent()).toContain(`from revision ${stored.revision}`);
      const chartCells = stored.snapshot.cells.filter((c) => c.result?.type === 'chart').length;
      expect(chartCells).toBeGreaterThan(0);
      expect(await w.page.locator('[data-kind=chart] .chart-view__canvas svg.marks, [data-kind=chart] .chart-view__canvas canvas').count()).toBe(chartCells);
      // Every value a formula stored is on the page under its name, in the cell's order.
      for (const cell of stored.snapshot.cells) {
        if (cell.result?.type !== 'values') continue;
        const names = await w.page.locator(`[data-snapshot-cell="${cell.name}"] [data-value-name]`).evaluateAll((dds) => dds.map((d) => (d as HTMLElement).dataset['valueName']));
        expect(names.sort()).toEqual(Object.keys(cell.result.values).sort());
      }
      const order = await w.page.locator('[data-snapshot-cell]').evaluateAll((els) => els.map((e) => (e as HTMLElement).dataset['snapshotCell']));
      expect(order).toEqual(stored.snapshot.cells.map((c) => c.name));

      // Nothing to edit: no editor, no cell or save controls.
      const buttons = await w.page.locator('button').evaluateAll((bs) => bs.map((b) => (b.textContent ?? '').trim() + ' ' + (b.getAttribute('aria-label') ?? '')));
      expect(buttons.filter((b) => /edit|save|add|delete|undo|run|publish|share/i.test(b))).toEqual([]);
      expect(await w.page.locator('.monaco-editor, [contenteditable=true], textarea').count()).toBe(0);
      expect(requested.filter((u) => /NotebookView|monaco|editor\.worker|engine\.worker|stableEditorScroll|\/editor-/.test(u))).toEqual([]);
      // Downloads of the recordings only because the publisher allowed them.
      expect(await w.page.locator('.published__files a[download]').count()).toBe(stored.allowDownloads ? (stored.files?.length ?? 0) : 0);

      await shot(w.page, 'published-1280');
      await w.page.setViewportSize({ width: 1024, height: 800 });
      await shot(w.page, 'published-1024');
      expect(w.problems).toEqual([]);
    } finally {
      await w.context.close();
    }
  });

  it('the analyst downloads a notebook file and opens it again from the library as a new notebook', { timeout: 180_000 }, async () => {
    const w = await watchedPage(browser, { width: 1280, height: 860 });
    try {
      await signInAs(w.page, server.url, 'analyst@ridgeline.test');
      const exported = await w.page.request.get(`${server.url}/api/notebooks/${story.notebookId}/export?recordings=1`);
      expect(exported.status()).toBe(200);
      const file = join(dir, 'chainring.cogbook.json');
      writeFileSync(file, await exported.body());

      await w.page.getByTestId('import-notebook-file').setInputFiles(file);
      await w.page.waitForURL(/\/notebooks\/[^/]+$/);
      const importedId = w.page.url().split('/').pop()!;
      expect(importedId).not.toBe(story.notebookId);
      await w.page.getByTestId('open-runs').waitFor();
      const imported = (await (await w.page.request.get(`${server.url}/api/notebooks/${importedId}`)).json()) as NotebookResponse;
      expect(imported.document.title).toBe(scenario.title);
      expect(imported.document.cells.map((c) => c.name)).toEqual(
        ((await (await w.page.request.get(`${server.url}/api/notebooks/${story.notebookId}`)).json()) as NotebookResponse).document.cells.map((c) => c.name),
      );
      // The recordings came along inside the file: both inputs are bound.
      expect(imported.document.slots.every((s) => s.uploadId !== null)).toBe(true);
      expect(w.problems).toEqual([]);
    } finally {
      await w.context.close();
    }
  });

  it('a published address that does not exist says so', { timeout: 60_000 }, async () => {
    const w = await watchedPage(browser);
    try {
      await w.page.goto(`${server.url}/p/no-such-finding`);
      await w.page.getByTestId('published-missing').waitFor();
      expect(await w.page.locator('h1').textContent()).toBe('This finding is not published');
      // The 404 of the page's own data request is the one message expected here.
      expect(w.problems.filter((p) => !p.includes('status of 404'))).toEqual([]);
    } finally {
      await w.context.close();
    }
  });
});
