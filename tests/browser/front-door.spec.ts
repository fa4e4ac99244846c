import { readFile } from 'node:fs/promises';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_SAMPLE_FILES } from '../../shared/demo/sample-files.js';
import { DEMO_SCENARIOS, listDemoScenarios } from '../../shared/demo/scenarios.js';
import { listTemplates } from '../../shared/demo/templates.js';
import { launchBrowser, watchedPage, type WatchedPage } from './support/browser';
import { startServer, type RunningServer } from './support/server';
import { signInAs } from './support/session';

// A new tester's first minutes on a fresh server with the demo lab: what the sign-in page
// says, what the library offers, the two sample files, and a notebook from a template.

let server: RunningServer;
let browser: Browser;
const opened: WatchedPage[] = [];

beforeAll(async () => {
  // A fresh data directory seeds the demo lab; on a busy machine that takes well over a minute.
  server = await startServer({}, { readyWithinMs: 170_000 });
  browser = await launchBrowser();
});

afterAll(async () => {
  for (const w of opened) await w.context.close();
  await browser?.close();
  await server?.stop();
});

async function freshPage(): Promise<WatchedPage> {
  const watched = await watchedPage(browser, { width: 1280, height: 800 });
  opened.push(watched);
  return watched;
}

/** Bytes of a file the page downloads when `link` is clicked, with the name the browser would save it under. */
async function download(page: Page, selector: string): Promise<{ name: string; bytes: Buffer }> {
  const [file] = await Promise.all([page.waitForEvent('download'), page.locator(selector).click()]);
  const path = await file.path();
  return { name: file.suggestedFilename(), bytes: await readFile(path) };
}

describe('front door', () => {
  it('the sign-in page says what Cogbook is for and how to try it', async () => {
    const { page, problems } = await freshPage();

    await page.goto(`${server.url}/`);
    await page.waitForURL(/\/sign-in/);

    const about = await page.getByRole('region', { name: 'About Cogbook' }).innerText();
    expect(about).toContain('compares a power meter under test with a reference power meter');
    expect(about).toContain('FIT and CSV recordings');
    const demo = await page.getByRole('complementary', { name: 'Trying it out?' }).innerText();
    expect(demo).toContain('cogbook-demo');
    expect(demo).toContain('analyst@ridgeline.test');

    await page.getByRole('button', { name: 'Fill in analyst@ridgeline.test' }).click();
    expect(await page.locator('#sign-in-email').inputValue()).toBe('analyst@ridgeline.test');
    expect(await page.locator('#sign-in-password').inputValue()).toBe('cogbook-demo');
    expect(problems).toEqual([]);
  });

  it('an analyst\'s library shows the demo notebooks, the templates with their cautions and the introduction', async () => {
    const { page, problems } = await freshPage();
    await signInAs(page, server.url, 'analyst@ridgeline.test');

    await expect.poll(() => page.locator('.library-table a').count(), { timeout: 30_000 }).toBeGreaterThanOrEqual(3);
    const table = await page.locator('.library-table').innerText();
    for (const s of listDemoScenarios()) expect(table).toContain(s.title);

    const intro = page.getByRole('region', { name: 'What Cogbook is for' });
    expect(await intro.innerText()).toContain('device under test');

    const gallery = page.getByRole('region', { name: 'Start from a template' });
    for (const t of listTemplates()) {
      await gallery.getByRole('heading', { name: t.title, exact: true }).waitFor();
    }
    const galleryText = await gallery.innerText();
    expect(galleryText).toContain('Secure the bike on the trainer');
    expect(galleryText).toContain('qualified mechanic');
    expect(galleryText).toContain('not a certification');

    const lab = page.getByRole('region', { name: 'Demo lab' });
    expect(await lab.innerText()).toContain(
      'Download these two files, start from the template ‘Per-leg by chainring’, and drop them into its inputs.',
    );
    expect(problems).toEqual([]);
  });

  it('both sample files download under their own names as FIT files', async () => {
    const { page, problems } = await freshPage();
    await signInAs(page, server.url, 'analyst@ridgeline.test');
    await page.locator('#demo-lab a[download]').nth(1).waitFor();

    for (const sample of DEMO_SAMPLE_FILES) {
      const { name, bytes } = await download(page, `#demo-lab a[data-slot="${sample.slot}"]`);
      expect(name).toBe(sample.fileName);
      // FIT file header: bytes 8-11 hold the ASCII ".FIT" (FIT SDK, "FIT File Header").
      expect(bytes.subarray(8, 12).toString('latin1')).toBe('.FIT');
      // Header size (byte 0) is 12 or 14, and the data size (bytes 4-7, little-endian) fits the file.
      expect([12, 14]).toContain(bytes[0]);
      expect(bytes.readUInt32LE(4)).toBeLessThanOrEqual(bytes.length - bytes[0]!);
    }
    expect(problems).toEqual([]);
  });

  it('starting from "Per-leg by chainring" creates the notebook and opens it', async () => {
    const { page, problems } = await freshPage();
    await signInAs(page, server.url, 'analyst@ridgeline.test');

    await page.getByRole('button', { name: 'Start from this template: Per-leg by chainring' }).click();
    await page.waitForURL(/\/notebooks\/[^/]+$/);

    const id = new URL(page.url()).pathname.split('/').pop()!;
    const stored = await page.request.get(`${server.url}/api/notebooks/${id}`);
    expect(stored.ok()).toBe(true);
    const body = (await stored.json()) as { document: { title: string; slots: { name: string; uploadId: string | null }[]; cells: { kind: string; config: { markdown?: string } }[] } };
    expect(body.document.title).toBe('Per-leg by chainring');
    expect(body.document.slots.map((s) => [s.name, s.uploadId])).toEqual([['reference', null], ['test', null]]);
    expect(body.document.cells[0]!.config.markdown).toContain('qualified mechanic');

    await page.goto(`${server.url}/library`);
    await page.locator(`.library-table a[href="/notebooks/${id}"]`).waitFor();
    expect(problems).toEqual([]);
  });

  it('the introduction stays hidden after it is dismissed, and comes back on request', async () => {
    const { page } = await freshPage();
    await signInAs(page, server.url, 'viewer@ridgeline.test');
    const intro = page.getByRole('region', { name: 'What Cogbook is for' });
    await intro.waitFor();

    await page.getByRole('button', { name: 'Hide this introduction' }).click();
    await page.reload();
    await page.getByRole('heading', { name: 'Notebooks', exact: true }).waitFor();
    expect(await intro.count()).toBe(0);

    await page.getByRole('button', { name: 'What is Cogbook for?' }).click();
    await intro.waitFor();
  });

  it('the two sample files dropped into a new per-leg notebook find the left leg reading high on the big ring', async () => {
    const { page, problems } = await freshPage();
    await signInAs(page, server.url, 'analyst@ridgeline.test');
    const files: { slot: string; name: string; bytes: Buffer }[] = [];
    for (const sample of DEMO_SAMPLE_FILES) {
      const { name, bytes } = await download(page, `#demo-lab a[data-slot="${sample.slot}"]`);
      files.push({ slot: sample.slot, name, bytes });
    }

    await page.getByRole('button', { name: 'Start from this template: Per-leg by chainring' }).click();
    await page.waitForURL(/\/notebooks\/[^/]+$/, { timeout: 60_000 });
    for (const f of files) {
      // The slot shows in the inputs panel and in its import cell; either takes the file.
      await page
        .locator(`[data-slot="${f.slot}"] input[type="file"]`)
        .first()
        .setInputFiles({ name: f.name, mimeType: 'application/octet-stream', buffer: f.bytes });
      await page.locator(`[data-slot="${f.slot}"][data-slot-state="ready"]`).first().waitFor({ timeout: 60_000 });
    }

    const cells = page.locator('[data-cell-id]');
    await expect
      .poll(async () => (await cells.count()) > 0 && (await page.locator('[data-cell-id]:not([data-state="fresh"])').count()) === 0, {
        timeout: 120_000,
        interval: 500,
      })
      .toBe(true);
    await expect.poll(() => page.locator('.chart-view[data-ready="true"]').count(), { timeout: 60_000 }).toBeGreaterThanOrEqual(2);

    // The demo ride's device under test reads 8% high on the left leg on the 50T only
    // (DEMO_SCENARIOS['chainring-gain'].truth); the finding must recover that within a point.
    const text = await page.locator('main').innerText();
    const value = (name: string): number => Number(new RegExp(`\\n${name}\\n([-+]?[\\d.]+)\\n`).exec(text)?.[1]);
    const truth = DEMO_SCENARIOS['chainring-gain'].truth.legGains!;
    expect(value('left_big')).toBeCloseTo(100 * (truth.left[50]! - 1), 0);
    expect(Math.abs(value('left_small'))).toBeLessThan(1);
    expect(Math.abs(value('right_big'))).toBeLessThan(1);
    expect(Math.abs(value('right_small'))).toBeLessThan(1);
    expect(problems).toEqual([]);
  });
});
