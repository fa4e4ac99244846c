import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchBrowser, watchedPage, type WatchedPage } from './support/browser';
import { startServer, type RunningServer } from './support/server';
import { signInAs } from './support/session';

// Accounts and roles as people meet them in the browser: sign up, create a notebook,
// sign out; a viewer cannot edit; a password-reset e-mail arrives and its link works.

let server: RunningServer;
let browser: Browser;
const opened: WatchedPage[] = [];

beforeAll(async () => {
  server = await startServer();
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

async function signOut(watched: WatchedPage): Promise<void> {
  await watched.page.getByRole('button', { name: 'Sign out' }).click();
  await watched.page.waitForURL(/\/sign-in/);
}

describe('accounts in the browser', () => {
  it('signs up, creates a notebook, signs out, and the notebook needs a sign-in again', async () => {
    const watched = await freshPage();
    const { page } = watched;
    await page.goto(`${server.url}/sign-up`);
    await page.locator('#sign-up-name').fill('Wren Halvard');
    await page.locator('#sign-up-email').fill('wren@example.test');
    await page.locator('#sign-up-password').fill('a long enough passphrase');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.waitForURL(/\/library$/);

    await page.getByRole('button', { name: 'New notebook' }).first().click();
    await page.locator('#new-notebook-title').fill('Hub against pedals, March');
    await page.getByRole('button', { name: 'Create and open' }).click();
    await page.waitForURL(/\/notebooks\/[^/]+$/);
    const notebookUrl = page.url();
    await page.getByRole('heading', { name: 'Hub against pedals, March' }).waitFor();

    await signOut(watched);
    await page.goto(notebookUrl);
    await page.waitForURL(/\/sign-in/);
    expect(watched.problems).toEqual([]);
  });

  it('a viewer opens a lab notebook read-only, with no way to edit it', async () => {
    const watched = await freshPage();
    const { page } = watched;
    await signInAs(page, server.url, 'viewer@ridgeline.test');
    await expect.poll(() => page.locator('.library-table a').count()).toBeGreaterThanOrEqual(1);
    await page.locator('.library-table a').first().click();
    await page.waitForURL(/\/notebooks\/[^/]+$/);
    await page.getByText('Read only · you are a viewer').waitFor();
    expect(await page.getByRole('button', { name: 'Undo' }).count()).toBe(0);
    expect(await page.locator('.nb-page__add').count()).toBe(0);

    // The API refuses a write from this session too (the page is not the only guard).
    const id = page.url().split('/').pop();
    const cookie = (await watched.context.cookies()).map((c) => `${c.name}=${c.value}`).join('; ');
    const headers = { cookie, origin: server.url, 'content-type': 'application/json' };
    const current = (await (await fetch(`${server.url}/api/notebooks/${id}`, { headers })).json()) as {
      revision: number;
      document: unknown;
    };
    const res = await fetch(`${server.url}/api/notebooks/${id}`, {
      method: 'PUT',
      headers,
      body: JSON.stringify({ baseRevision: current.revision, document: current.document }),
    });
    const status = res.status;
    expect(status).toBe(403);
    expect(watched.problems).toEqual([]);
  });

  it('a reset e-mail arrives in the outbox and its link sets a new password', async () => {
    const asker = await freshPage();
    await asker.page.goto(`${server.url}/forgot-password`);
    await asker.page.locator('#forgot-email').fill('viewer@ridgeline.test');
    await asker.page.getByRole('button', { name: 'Send reset link' }).click();
    await asker.page.getByRole('status').waitFor();

    const admin = await freshPage();
    await signInAs(admin.page, server.url, 'admin@ridgeline.test');
    await admin.page.goto(`${server.url}/outbox`);
    const list = admin.page.getByRole('navigation', { name: 'Kept mail' });
    await list.getByRole('button').filter({ hasText: 'viewer@ridgeline.test' }).first().click();
    const link = admin.page.locator('.outbox-message a[href*="reset-password"]').first();
    const href = await link.getAttribute('href');
    expect(href).toBeTruthy();

    const { page } = asker;
    await page.goto(href!);
    await page.waitForURL(/\/reset-password\?token=/);
    await page.locator('#reset-password').fill('a fresh passphrase 42');
    await page.locator('#reset-repeat').fill('a fresh passphrase 42');
    await page.getByRole('button', { name: 'Set password' }).click();
    await page.getByRole('link', { name: 'Go to sign-in' }).waitFor();

    await signInAs(page, server.url, 'viewer@ridgeline.test', 'a fresh passphrase 42');
    expect(asker.problems).toEqual([]);
    expect(admin.problems).toEqual([]);
  });
});
