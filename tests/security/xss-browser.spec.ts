import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { NOTEBOOK_SCHEMA_VERSION } from '../../shared/notebook/document.js';
import { launchBrowser, watchedPage } from '../browser/support/browser.js';
import { startServer, type RunningServer } from '../browser/support/server.js';
import { createNotebook, personalWorkspace, signUpClient, type Client } from '../stress/support/http-client.js';

/**
 * Markup planted in everything a user can type, rendered by the built app in Chromium
 * under its real policy. Every payload sets window.__pwned if it ever runs; it must
 * stay unset and the page must report no CSP violation (a blocked inline script would
 * mean the markup reached the DOM live). Needs `npm run build` (dist/client and dist/node).
 */
const PAYLOADS = [
  '<img src=x onerror="window.__pwned=(window.__pwned||0)+1">',
  '<script>window.__pwned=2</script>',
  '<svg onload="window.__pwned=3"><circle r=5 /></svg>',
  '[click me](javascript:window.__pwned=4)',
  '<a href="javascript:window.__pwned=5">link</a>',
  '<iframe srcdoc="<script>parent.__pwned=6</script>"></iframe>',
  '<details open ontoggle="window.__pwned=7">x</details>',
  '"><img src=x onerror=window.__pwned=8>',
];
const markup = PAYLOADS.join('\n\n');

let server: RunningServer;
let browser: Browser;
let client: Client;
let notebookId: string;

beforeAll(async () => {
  server = await startServer({ DATABASE_URL: '', SEED_DEMO: '0' }, { readyWithinMs: 180_000 });
  browser = await launchBrowser();
  client = await signUpClient(server.url, 'mallory@lab.test', '<img src=x onerror=window.__pwned=9>');
  const workspaceId = await personalWorkspace(client);
  // A CSV whose column names are markup, bound to the notebook's slot.
  const form = new FormData();
  form.set('workspaceId', workspaceId);
  const csv = `time,<img src=x onerror=window.__pwned=10>,power\n${Array.from({ length: 30 }, (_, i) => `${i},${i},${200 + i}`).join('\n')}\n`;
  form.append('file', new Blob([csv]), '<svg onload=window.__pwned=11>.csv');
  const up = await client.json<{ uploads: { id: string }[] }>('/api/uploads', { method: 'POST', body: form });
  expect(up.status).toBe(201);
  const hostileSpec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: '<img src=x onerror=window.__pwned=12>',
    data: { values: [{ a: 1, b: 2, u: 'javascript:window.__pwned=13', t: '<b onmouseover=window.__pwned=14>x</b>' }] },
    mark: { type: 'point', href: 'javascript:window.__pwned=15' },
    encoding: { x: { field: 'a', type: 'quantitative', title: '<svg onload=window.__pwned=16>' }, y: { field: 'b', type: 'quantitative' }, href: { field: 'u' }, tooltip: { field: 't' } },
  };
  const urlSpec = { data: { url: 'javascript:window.__pwned=17' }, mark: 'point' };
  notebookId = await createNotebook(client, workspaceId, {
    schemaVersion: NOTEBOOK_SCHEMA_VERSION,
    title: PAYLOADS[0]!,
    description: markup,
    parameters: [{ name: 'tolerance', value: 2, unit: '<b>%</b>', label: PAYLOADS[2]! }],
    slots: [{ id: 's1', name: 'reference', label: PAYLOADS[1]!, uploadId: up.body.uploads[0]!.id }],
    cells: [
      { id: 'c1', kind: 'note', name: 'intro', config: { markdown: markup } },
      { id: 'c2', kind: 'import', name: 'ref', config: { slot: 'reference' } },
      { id: 'c3', kind: 'chart', name: 'hostile_chart', config: { preset: 'traces', title: PAYLOADS[7]!, bindings: {}, spec: hostileSpec } },
      { id: 'c4', kind: 'chart', name: 'url_chart', config: { preset: 'traces', bindings: {}, spec: urlSpec } },
      { id: 'c5', kind: 'formula', name: 'escape', config: { source: 'leak = cos.constructor("return this")()' } },
      { id: 'c6', kind: 'note', name: 'outro', config: { markdown: '<img src=x onerror="window.__pwned=18">' } },
    ],
  });
}, 400_000);
afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

describe('planted markup never runs', () => {
  it('in the library, the notebook, its cells, charts and the CSV columns', { timeout: 300_000 }, async () => {
    const watched = await watchedPage(browser);
    const { page, context } = watched;
    const url = new URL(server.url);
    await context.addCookies(
      client.cookie.split('; ').map((pair) => {
        const [name, ...rest] = pair.split('=');
        return { name: name!, value: rest.join('='), domain: url.hostname, path: '/', httpOnly: true, sameSite: 'Lax' as const };
      }),
    );
    await page.goto(`${server.url}/library`);
    await page.getByText('window.__pwned=(window.__pwned||0)+1', { exact: false }).first().waitFor({ timeout: 60_000 });

    await page.waitForTimeout(1000);
    const atLibrary = watched.problems.length;
    await page.goto(`${server.url}/notebooks/${notebookId}`);
    await page.locator('[data-cell-id="c1"]').waitFor({ timeout: 90_000 });
    await page.waitForTimeout(1000);
    const atNotebookOpen = watched.problems.length;
    // The note is rendered as HTML (sanitised): its link text is there, its script is not.
    await page.locator('[data-cell-id="c1"] .cell-output__note').waitFor({ timeout: 60_000 });
    // Inspect the live DOM of every rendered note: no handler attributes, no active elements, no script links.
    const live = (await page.evaluate(`(() => {
      const found = [];
      for (const el of document.querySelectorAll('.cell-output__note *, .cell-output__note')) {
        for (const a of el.attributes) if (/^on/i.test(a.name) || /^\\s*javascript:/i.test(a.value)) found.push(el.tagName + ' ' + a.name + '=' + a.value);
        if (/^(SCRIPT|IFRAME|SVG|OBJECT|EMBED|FORM)$/i.test(el.tagName)) found.push(el.tagName);
      }
      return { found, text: document.querySelector('[data-cell-id="c1"] .cell-output__note').textContent };
    })()`)) as { found: string[]; text: string };
    expect(live.found).toEqual([]);
    expect(live.text).toContain('click me');

    // The escape attempt in the formula ends as an error in its own cell.
    const formula = page.locator('[data-cell-id="c5"]');
    await expect.poll(async () => formula.getAttribute('data-state'), { timeout: 120_000, interval: 500 }).toMatch(/^(failed|error)$/);
    // (mathjs cannot even parse the call on a call, so the cell's own message points at it; the
    // code editor's text is not read here, as it may still be on its way.)
    await expect.poll(async () => (await formula.locator('.cell-output').textContent()) ?? '', { timeout: 30_000 }).toMatch(/This cell failed \(line 1, column \d+\)/);

    // Give charts and the import time to render, then hover and click what a user could.
    await page.waitForTimeout(3000);
    for (const mark of await page.locator('.chart-view svg path, .chart-view svg a').all()) {
      await mark.hover({ timeout: 2000 }).catch(() => undefined);
    }
    await page.locator('.chart-view svg a').first().click({ timeout: 2000 }).catch(() => undefined);
    await page.locator('[data-cell-id="c1"] a').first().click({ timeout: 2000, modifiers: ['Control'] }).catch(() => undefined);

    const handlers = (await page.evaluate(`[...document.querySelectorAll('*')].filter((el) => [...el.attributes].some((a) => /^on/i.test(a.name))).map((el) => {
      const path = []; for (let e = el; e && path.length < 6; e = e.parentElement) path.push(e.tagName + (e.className && typeof e.className === 'string' ? '.' + e.className.split(' ')[0] : ''));
      return path.join(' < ') + ' :: ' + el.outerHTML.slice(0, 120);
    })`)) as string[];
    expect(handlers, 'elements carrying inline event handlers').toEqual([]);
    expect(await page.evaluate('window.__pwned')).toBeUndefined();
    // Chromium reports an inline handler to the policy as soon as any parser tied to the page
    // creates it, inert ones included: a report means planted markup was parsed as markup.
    expect(atLibrary, 'problems on the library page').toBe(0);
    expect(watched.problems, `problems (${atNotebookOpen} once the notebook opened)`).toEqual([]);
    await context.close();
  });

  it('on the published page, read signed out', { timeout: 300_000 }, async () => {
    const published = await client.json<{ slug: string }>(`/api/notebooks/${notebookId}/publication`, {
      method: 'POST',
      body: JSON.stringify({ allowDownloads: true }),
      headers: { 'content-type': 'application/json' },
      // The server computes the snapshot itself: slow on a busy machine.
      timeoutMs: 240_000,
    });
    expect(published.status).toBe(200);
    const watched = await watchedPage(browser);
    const { page, context } = watched;
    await page.goto(`${server.url}/published/${published.body.slug}`);
    await page.locator('[data-snapshot-cell="intro"]').waitFor({ timeout: 90_000 });
    // The planted title is shown as text.
    await page.getByText('window.__pwned=(window.__pwned||0)+1', { exact: false }).first().waitFor({ timeout: 60_000 });
    await page.waitForTimeout(3000);
    for (const mark of await page.locator('.chart-view svg path, .chart-view svg a').all()) {
      await mark.hover({ timeout: 2000 }).catch(() => undefined);
    }
    const live = (await page.evaluate(`[...document.querySelectorAll('*')].flatMap((el) => [...el.attributes]
      .filter((a) => /^on/i.test(a.name) || /^\\s*javascript:/i.test(a.value))
      .map((a) => el.tagName + ' ' + a.name + '=' + a.value))`)) as string[];
    expect(live, 'handlers or script links in the published page').toEqual([]);
    expect(await page.evaluate('window.__pwned')).toBeUndefined();
    expect(watched.problems).toEqual([]);
    await context.close();
  });
});
