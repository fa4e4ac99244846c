import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_WORKSPACE_NAME } from '../../server/services/seed.js';
import { launchBrowser, watchedPage, type WatchedPage } from './support/browser';
import { startServer, type RunningServer } from './support/server';
import { signInAs } from './support/session';

// Inviting someone without an account: the admin sends the invitation from the team page,
// the mail shows in the local outbox, the invitee opens its link, signs up with the invited
// address, comes back to the invitation and lands in the workspace.

let server: RunningServer;
let browser: Browser;
const opened: WatchedPage[] = [];

// A fresh data directory seeds the demo lab: on a busy machine that can take minutes.
beforeAll(async () => {
  server = await startServer({}, { readyWithinMs: 280_000 });
  browser = await launchBrowser();
}, 300_000);

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

describe('invitations in the browser', () => {
  it('an invited address signs up through the mailed link and lands in the workspace', async () => {
    const admin = await freshPage();
    await signInAs(admin.page, server.url, 'admin@ridgeline.test');
    await admin.page.goto(`${server.url}/team`);
    await admin.page.getByRole('heading', { name: 'Invite a member' }).waitFor();
    await admin.page.locator('#team-invite-email').fill('Juno.Vale@example.test');
    await admin.page.getByRole('button', { name: 'Send invitation' }).click();
    const pending = admin.page.getByRole('region', { name: 'Pending invitations' });
    await pending.getByRole('cell', { name: 'juno.vale@example.test', exact: true }).waitFor();

    await admin.page.goto(`${server.url}/outbox`);
    const list = admin.page.getByRole('navigation', { name: 'Kept mail' });
    await list.getByRole('button').filter({ hasText: 'juno.vale@example.test' }).first().click();
    const href = await admin.page.locator('.outbox-message a[href*="/invitations/"]').first().getAttribute('href');
    expect(href).toMatch(new RegExp(`^${server.url}/invitations/[A-Za-z0-9_-]{43}$`));

    const invitee = await freshPage();
    const { page } = invitee;
    await page.goto(href!);
    await page.getByText(`to the workspace ${DEMO_WORKSPACE_NAME} as Analyst`).waitFor();
    await page.getByRole('link', { name: 'Create an account' }).click();
    await page.waitForURL(/\/sign-up\?redirect=/);
    await page.locator('#sign-up-name').fill('Juno Vale');
    await page.locator('#sign-up-email').fill('juno.vale@example.test');
    await page.locator('#sign-up-password').fill('a long enough passphrase');
    await page.getByRole('button', { name: 'Create account' }).click();
    await page.waitForURL(/\/invitations\//);
    await page.getByRole('button', { name: `Join ${DEMO_WORKSPACE_NAME}` }).click();
    await page.waitForURL(/\/library$/);
    await page.getByText('You are an analyst here.').waitFor();
    await expect.poll(() => page.locator('.shell-workspace').innerText()).toContain(DEMO_WORKSPACE_NAME);

    expect(invitee.problems).toEqual([]);
    // The link is used up (the browser logs the API's 404 for it); the admin sees the new member and no pending invitation.
    await page.goto(href!);
    await page.getByText('This invitation link does not work (any more).').waitFor();
    await admin.page.goto(`${server.url}/team`);
    await admin.page.getByRole('cell', { name: 'Juno Vale', exact: true }).waitFor();
    await admin.page.getByText('None. Invitations show here').waitFor();
    expect(invitee.problems.every((p) => p.includes('status of 404'))).toBe(true);
    expect(admin.problems).toEqual([]);
  }, 240_000);

  it('an admin revokes a pending invitation and its link stops working', async () => {
    const admin = await freshPage();
    await signInAs(admin.page, server.url, 'admin@ridgeline.test');
    await admin.page.goto(`${server.url}/team`);
    await admin.page.locator('#team-invite-email').fill('kit.morrow@example.test');
    await admin.page.getByRole('button', { name: 'Send invitation' }).click();
    const revoke = admin.page.getByRole('button', { name: 'Revoke the invitation to kit.morrow@example.test' });
    await revoke.click();
    await admin.page.getByRole('button', { name: 'Revoke', exact: true }).click();
    await admin.page.getByText('The invitation to kit.morrow@example.test was revoked.').waitFor();
    await expect.poll(() => revoke.count()).toBe(0);
    expect(admin.problems).toEqual([]);
  });
});
