import { readFileSync } from 'node:fs';
import type { Browser, Page } from 'playwright-core';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_SCENARIOS } from '../../shared/demo/scenarios.js';
import { launchBrowser, watchedPage, type WatchedPage } from './support/browser';
import { startServer, type RunningServer } from './support/server';
import { signInAs } from './support/session';
import { until } from './support/until';

// Every page, audited with axe-core at the two widths the app is laid out for. Serious and
// critical findings fail; lesser ones are printed so they stay visible.

const AXE_SOURCE = readFileSync('node_modules/axe-core/axe.min.js', 'utf8');
const WIDTHS = [1280, 1024] as const;

/**
 * Findings in pages this suite does not own, reported to their owners and printed rather
 * than failed on until fixed. Each names the page, the rule and the elements; anything else
 * on those pages still fails.
 */
const KNOWN_ELSEWHERE: { page: RegExp; rule: string; targets: RegExp; owner: string }[] = [
];

interface Finding {
  id: string;
  impact: string | null;
  help: string;
  targets: string[];
}

let server: RunningServer;
let browser: Browser;
const opened: WatchedPage[] = [];

beforeAll(async () => {
  // A fresh data directory seeds the demo lab; on a busy machine that takes well over a minute.
  server = await startServer({}, { readyWithinMs: 360_000 });
  browser = await launchBrowser();
}, 400_000);

// A notebook left open keeps computing in its worker and slows every later page.
afterEach(async () => {
  for (const w of opened.splice(0)) await w.context.close();
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

async function pageAt(width: number): Promise<WatchedPage> {
  const watched = await watchedPage(browser, { width, height: 800 });
  opened.push(watched);
  return watched;
}

/**
 * Runs axe in the page. The source goes in through the DevTools protocol (page.evaluate of
 * a string), which the page's CSP does not govern, so the app's own policy stays as shipped.
 */
async function audit(page: Page): Promise<Finding[]> {
  await page.evaluate(AXE_SOURCE);
  return page.evaluate(`axe.run(document, { resultTypes: ['violations'] }).then((r) => r.violations.map((v) => ({
    id: v.id, impact: v.impact, help: v.help, targets: v.nodes.map((n) => n.target.join(' ')),
  })))`);
}

/**
 * Opens a page, lets it settle and audits it; answers the serious and critical findings, or
 * with `every` all findings whatever their impact (pages held to zero violations).
 */
async function check(page: Page, path: string, ready: string, label: string, options: { every?: boolean } = {}): Promise<string[]> {
  await page.goto(`${server.url}${path}`);
  // Generous: on a busy machine the first load of a chunk can take a while.
  await page.locator(ready).first().waitFor({ timeout: 60_000 });
  await page.waitForLoadState('networkidle');
  return options.every ? reportEvery(page, label) : report(page, label);
}

/** Every finding, minor ones included, and no allowance from {@link KNOWN_ELSEWHERE}. */
async function reportEvery(page: Page, label: string): Promise<string[]> {
  return (await audit(page)).map((f) => `${label}: ${f.impact} ${f.id} - ${f.help} - ${f.targets.slice(0, 5).join(' | ')}`);
}

function knownElsewhere(label: string, f: Finding): string | null {
  const known = KNOWN_ELSEWHERE.find((k) => k.page.test(label) && k.rule === f.id && f.targets.every((t) => k.targets.test(t)));
  return known ? known.owner : null;
}

async function report(page: Page, label: string): Promise<string[]> {
  const findings = await audit(page);
  const lesser = findings.filter((f) => f.impact !== 'serious' && f.impact !== 'critical');
  if (lesser.length) console.log(`${label}: ${lesser.map((f) => `${f.impact} ${f.id} (${f.targets.length})`).join(', ')}`);
  const grave = findings.filter((f) => f.impact === 'serious' || f.impact === 'critical');
  for (const f of grave) {
    const owner = knownElsewhere(label, f);
    if (owner) console.log(`${label}: known ${f.impact} ${f.id} (${f.targets.length}) in ${owner}`);
  }
  return grave
    .filter((f) => !knownElsewhere(label, f))
    .map((f) => `${label}: ${f.impact} ${f.id} - ${f.help} - ${f.targets.slice(0, 5).join(' | ')}`);
}

/**
 * Invites `email` to the demo lab as the signed-in admin of `page` and answers the link's
 * token, read from the mail the invitation left in the local outbox.
 */
async function inviteAndReadToken(page: Page, email: string): Promise<string> {
  const { workspaces } = (await (await page.request.get(`${server.url}/api/workspaces`)).json()) as { workspaces: { id: string; personal: boolean }[] };
  const lab = workspaces.find((w) => !w.personal);
  if (!lab) throw new Error('the admin has no shared workspace');
  const sent = await page.request.post(`${server.url}/api/workspaces/${lab.id}/invitations`, { data: { email, role: 'viewer' } });
  expect(sent.status()).toBe(201);
  let text = '';
  await until(`the invitation mail to ${email}`, async () => {
    const { messages } = (await (await page.request.get(`${server.url}/api/outbox`)).json()) as { messages: { id: string; to: string }[] };
    const mail = messages.find((m) => m.to.includes(email));
    if (mail) text = ((await (await page.request.get(`${server.url}/api/outbox/${mail.id}`)).json()) as { text: string }).text;
    return mail !== undefined;
  });
  const token = /\/invitations\/([A-Za-z0-9_-]{43})/.exec(text)?.[1];
  if (!token) throw new Error(`no invitation link in the mail to ${email}:\n${text}`);
  return token;
}

async function chainringNotebookPath(page: Page): Promise<string> {
  const res = await page.request.get(`${server.url}/api/notebooks`);
  const { notebooks } = (await res.json()) as { notebooks: { id: string; title: string }[] };
  const demo = notebooks.find((n) => n.title === DEMO_SCENARIOS['chainring-gain'].title);
  if (!demo) throw new Error('the chainring demo notebook is missing from the seeded lab');
  return `/notebooks/${demo.id}`;
}

describe.each(WIDTHS)('axe at %i px', (width) => {
  it('signed-out pages: sign-in, sign-up, forgot and reset password, not found', async () => {
    const { page, problems } = await pageAt(width);
    const found = [
      ...(await check(page, '/sign-in', 'h1', 'sign-in')),
      ...(await check(page, '/sign-up', 'h1', 'sign-up')),
      ...(await check(page, '/forgot-password', 'h1', 'forgot-password')),
      ...(await check(page, '/reset-password?token=not-a-real-token', 'h1', 'reset-password')),
      ...(await check(page, '/reset-password', 'h1', 'reset-password (broken link)')),
      ...(await check(page, '/no/such/page', 'h1', 'not-found (signed out)')),
    ];
    expect(found).toEqual([]);
    expect(problems).toEqual([]);
  });

  // Four pages and a dialog, the notebook computing all its cells: minutes on a busy machine.
  it('analyst: library, its new-notebook dialog, the chainring demo notebook, not found', { timeout: 300_000 }, async () => {
    const { page, problems } = await pageAt(width);
    await signInAs(page, server.url, 'analyst@ridgeline.test');
    const found = [...(await check(page, '/library', '#demo-lab a[download]', 'library (analyst)'))];

    await page.getByRole('button', { name: 'New notebook' }).first().click();
    await page.getByRole('dialog').waitFor();
    await page.waitForTimeout(400);
    found.push(...(await report(page, 'library new-notebook dialog')));
    await page.keyboard.press('Escape');

    found.push(...(await check(page, await chainringNotebookPath(page), 'main h1', 'notebook (chainring demo)')));
    found.push(...(await check(page, '/no/such/page', 'h1', 'not-found (signed in)')));
    expect(found).toEqual([]);
    expect(problems).toEqual([]);
  });

  it('viewer: library', async () => {
    const { page, problems } = await pageAt(width);
    await signInAs(page, server.url, 'viewer@ridgeline.test');
    expect(await check(page, '/library', '.library-table a', 'library (viewer)')).toEqual([]);
    expect(problems).toEqual([]);
  });

  it('admin: library, team, outbox', async () => {
    const { page, problems } = await pageAt(width);
    await signInAs(page, server.url, 'admin@ridgeline.test');
    const found = [
      ...(await check(page, '/library', '.library-table a', 'library (admin)')),
      ...(await check(page, '/team', 'h1', 'team')),
      ...(await check(page, '/outbox', 'h1', 'outbox')),
    ];
    expect(found).toEqual([]);
    expect(problems).toEqual([]);
  });
});

// The invitation page in every state a mailed link can meet, held to zero findings of any impact.
describe.each(WIDTHS)('axe on the invitation page at %i px', (width) => {
  it('a pending invitation signed out, as someone else and as the invitee; an unknown and a used link', { timeout: 300_000 }, async () => {
    const email = `axe-invitee-${width}@example.test`;
    const admin = await pageAt(width);
    await signInAs(admin.page, server.url, 'admin@ridgeline.test');
    const token = await inviteAndReadToken(admin.page, email);
    const link = `/invitations/${token}`;
    const found = [...(await check(admin.page, link, 'text=You are signed in as', 'invitation (signed in as someone else)', { every: true }))];

    const invitee = await pageAt(width);
    const { page } = invitee;
    found.push(...(await check(page, link, 'text=Create an account', 'invitation (signed out)', { every: true })));
    found.push(...(await check(page, `/invitations/${'u'.repeat(43)}`, 'text=This invitation link does not work', 'invitation (unknown link)', { every: true })));

    // Sign up with the invited address from the page, come back to it, join, and open the used link.
    await page.goto(`${server.url}${link}`);
    await page.getByRole('link', { name: 'Create an account' }).click();
    await page.waitForURL(/\/sign-up\?redirect=/);
    await page.locator('#sign-up-name').fill(`Axe Invitee ${width}`);
    await page.locator('#sign-up-email').fill(email);
    await page.locator('#sign-up-password').fill('a long enough passphrase');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.waitForURL(/\/invitations\//);
    const join = page.getByRole('button', { name: /^Join / });
    await join.waitFor();
    await page.waitForLoadState('networkidle');
    found.push(...(await reportEvery(page, 'invitation (signed in as the invitee)')));
    await join.click();
    await page.waitForURL(/\/library$/);
    found.push(...(await check(page, link, 'text=This invitation link does not work', 'invitation (used link)', { every: true })));

    expect(found).toEqual([]);
    expect(admin.problems).toEqual([]);
    // The unknown and the used link answer 404, which the browser logs; nothing else may show.
    expect(invitee.problems.filter((p) => !p.includes('status of 404'))).toEqual([]);
    expect(invitee.problems.length).toBeGreaterThan(0);
  });
});

/** Whether the focused element, or the control wrapping it, draws a ring or outline. */
const FOCUS_SHOWN = `(() => {
    const el = document.activeElement;
    if (!el || el === document.body) return { tag: 'body', shown: false };
    const drawn = (e) => {
      const s = getComputedStyle(e);
      return (s.outlineStyle !== 'none' && parseFloat(s.outlineWidth) > 0) || s.boxShadow !== 'none';
    };
    let shown = false;
    for (let e = el, i = 0; e && i < 4 && !shown; e = e.parentElement, i++) shown = drawn(e);
    const name = el.getAttribute('aria-label') || el.textContent.trim().slice(0, 40);
    return { tag: el.tagName.toLowerCase() + (el.className && typeof el.className === 'string' ? '.' + el.className.split(' ')[0] : ''), name, shown };
  })()`;

describe('keyboard on the library', () => {
  it('every Tab stop shows where the focus is, and the templates and downloads are reachable', async () => {
    const { page } = await pageAt(1280);
    await signInAs(page, server.url, 'analyst@ridgeline.test');
    await page.locator('#demo-lab a[download]').nth(1).waitFor();

    const stops: { tag: string; name: string; shown: boolean }[] = [];
    await page.locator('body').click({ position: { x: 600, y: 5 } });
    for (let i = 0; i < 60; i++) {
      await page.keyboard.press('Tab');
      // Rings fade in over the UI kit's 0.2 s transition.
      await page.waitForTimeout(250);
      stops.push(await page.evaluate(FOCUS_SHOWN));
    }
    // Past the last control the focus leaves the page (body) before wrapping round.
    const hidden = stops.filter((s) => !s.shown && s.tag !== 'body').map((s) => `${s.tag} "${s.name}"`);
    expect(hidden).toEqual([]);
    const names = stops.map((s) => s.name);
    expect(names).toContain('Start from this template: Per-leg by chainring');
    expect(names).toContain('Hide this introduction');
    expect(names.some((n) => n.endsWith('.fit'))).toBe(true);
  });

  it('a template starts from the keyboard alone', async () => {
    const { page } = await pageAt(1024);
    await signInAs(page, server.url, 'analyst@ridgeline.test');
    const start = page.getByRole('button', { name: 'Start from this template: Steady blocks' });
    await start.focus();
    await page.keyboard.press('Enter');
    // The notebook page is the biggest chunk: the address changes once it has loaded.
    await page.waitForURL(/\/notebooks\/[^/]+$/, { timeout: 60_000 });
  });
});

describe('keyboard in the notebook editor', () => {
  it('the cell toolbar buttons and a cell reached with j show where the focus is', { timeout: 240_000 }, async () => {
    const { page, problems } = await pageAt(1024);
    await signInAs(page, server.url, 'analyst@ridgeline.test');
    await page.goto(`${server.url}${await chainringNotebookPath(page)}`);
    const firstCell = page.locator('[data-cell-id]').first();
    await firstCell.waitFor({ timeout: 60_000 });
    await page.waitForLoadState('networkidle');

    // From the cell's name, Tab walks its toolbar.
    await firstCell.locator('.nb-cell__name-button').focus();
    // The button itself must draw the ring: the focused cell around it has a resting shadow of its own.
    const OWN_RING = `(() => {
      const el = document.activeElement;
      const s = getComputedStyle(el);
      return { tag: el.tagName.toLowerCase(), name: el.getAttribute('aria-label') || '', shown: s.outlineStyle !== 'none' && parseFloat(s.outlineWidth) >= 2 };
    })()`;
    const stops: { tag: string; name: string; shown: boolean }[] = [];
    for (let i = 0; i < 4; i++) {
      await page.keyboard.press('Tab');
      await page.waitForTimeout(250);
      stops.push(await page.evaluate(OWN_RING));
    }
    expect(stops.map((s) => s.name)).toEqual(expect.arrayContaining(['Fold cell', 'Move cell down', 'Duplicate cell']));
    expect(stops.filter((s) => !s.shown).map((s) => `${s.tag} "${s.name}"`)).toEqual([]);

    // j moves to the next cell and focuses the cell itself: it draws the focus ring.
    await page.keyboard.press('Escape');
    await page.evaluate('document.activeElement && document.activeElement.blur()');
    await page.keyboard.press('j');
    await page.waitForTimeout(400);
    const cell = (await page.evaluate(`(() => {
      const el = document.activeElement;
      const s = getComputedStyle(el);
      // The app's ring (--cb-focus) is a 4 px spread shadow; a focused cell's resting shadow is not.
      return { cell: el.hasAttribute('data-cell-id'), ring: el.matches(':focus-visible') && s.boxShadow.includes('0px 0px 0px 4px') };
    })()`)) as { cell: boolean; ring: boolean };
    expect(cell).toEqual({ cell: true, ring: true });
    expect(problems).toEqual([]);
  });
});
