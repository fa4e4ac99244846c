import type { Browser, Request } from 'playwright-core';
import { installProbe, waitForMark, type PageMarks } from './page-probe.js';

/** One signed-out visit of a published page, in a fresh context (empty cache). */
export interface PublishedVisit {
  marks: PageMarks;
  /** Response bytes received (headers and encoded bodies), every request of the visit. */
  bytes: number;
  requests: number;
  /** Requests that would carry a raw recording (uploads, their content, published files). */
  recordingRequests: string[];
}

/** Paths that serve recording bytes: a reader's page must never need them. */
const RECORDING_PATH = /\/api\/uploads\/|\/content(\?|$)|\/api\/published\/[^/]+\/files\//;

/** Opens `/p/<slug>` signed out and waits for `until` (the first chart, or the first number). */
export async function visitPublished(browser: Browser, baseUrl: string, slug: string, until: 'firstChart' | 'firstValue'): Promise<PublishedVisit> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
  try {
    const page = await context.newPage();
    await installProbe(page);
    const recordingRequests: string[] = [];
    const finished: Promise<number>[] = [];
    page.on('request', (r: Request) => {
      if (RECORDING_PATH.test(new URL(r.url()).pathname)) recordingRequests.push(r.url());
    });
    page.on('requestfinished', (r: Request) => {
      finished.push(r.sizes().then((s) => s.responseHeadersSize + s.responseBodySize, () => 0));
    });
    await page.goto(`${baseUrl}/p/${slug}`, { timeout: 300_000 });
    await waitForMark(page, until, 300_000);
    // Everything the page asked for while drawing is counted, including what came after the mark.
    await page.waitForLoadState('networkidle', { timeout: 60_000 }).catch(() => undefined);
    const marks = await page.evaluate(() => (globalThis as { __cbBench?: { read: () => PageMarks } }).__cbBench?.read() ?? {});
    const sizes = await Promise.all(finished);
    return { marks, bytes: sizes.reduce((a, b) => a + b, 0), requests: sizes.length, recordingRequests };
  } finally {
    await context.close();
  }
}
