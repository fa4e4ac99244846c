import { mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { NotebookResponse, RevisionListResponse, RevisionResponse } from '../../shared/api/notebooks.js';
import { launchBrowser, watchedPage, type WatchedPage } from './support/browser.js';
import { startServer, type RunningServer } from './support/server.js';
import { signInAs } from './support/session.js';
import { until } from './support/until.js';

let server: RunningServer;
let browser: Browser;

beforeAll(async () => {
  const seeded = process.env['COGBOOK_BROWSER_DATA_DIR'];
  [server, browser] = await Promise.all([startServer(seeded ? { DATA_DIR: seeded } : {}), launchBrowser()]);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
});

/** GET through the page's own session (the same cookies as the person at that page). */
async function api<T>(page: Page, path: string): Promise<T> {
  const res = await page.request.get(`${server.url}${path}`);
  expect(res.status(), path).toBe(200);
  return (await res.json()) as T;
}

/** Every stored revision of a notebook, oldest first, with its document as JSON text. */
async function revisions(page: Page, id: string): Promise<{ revision: number; text: string }[]> {
  const list = await api<RevisionListResponse>(page, `/api/notebooks/${id}/revisions`);
  const out: { revision: number; text: string }[] = [];
  for (const r of [...list.revisions].reverse()) {
    const one = await api<RevisionResponse>(page, `/api/notebooks/${id}/revisions/${r.revision}`);
    out.push({ revision: r.revision, text: JSON.stringify(one.document) });
  }
  return out;
}

const note = (page: Page) => page.locator('[data-kind="note"] textarea').first();

/** Types into the note and waits for the autosave to land. */
async function writeNoteAndSave(page: Page, text: string): Promise<void> {
  await note(page).fill(text);
  await page.locator('[data-save-state="saved"]').waitFor({ timeout: 30_000 });
}

/** Types into the note; the autosave is refused with 409 and the conflict dialog opens. */
async function writeNoteAndConflict(page: Page, text: string): Promise<void> {
  const refused = page.waitForResponse((r) => r.request().method() === 'PUT' && /\/api\/notebooks\/[^/]+$/.test(r.url()) && r.status() === 409, { timeout: 30_000 });
  await note(page).fill(text);
  await refused;
  await page.getByRole('dialog', { name: 'This notebook changed on the server' }).waitFor();
}

async function shot(page: Page, name: string): Promise<void> {
  const out = process.env['COGBOOK_SHOTS'];
  if (!out) return;
  mkdirSync(out, { recursive: true });
  await page.screenshot({ path: join(out, `${name}.png`) });
}

describe('two people editing one notebook', () => {
  const watched: WatchedPage[] = [];

  it('refuses a save based on an old revision, shows the conflict dialog, and either choice keeps every saved revision intact', async () => {
    const a = await watchedPage(browser);
    const b = await watchedPage(browser);
    watched.push(a, b);
    for (const w of watched) await w.page.addInitScript('globalThis.__name = (f) => f');
    const anna = a.page;
    const ben = b.page;
    try {
      // Anna (analyst) makes a notebook with a note; Ben (admin of the same workspace) opens it.
      await signInAs(anna, server.url, 'analyst@ridgeline.test');
      await anna.getByRole('button', { name: 'New notebook' }).click();
      await anna.locator('#new-notebook-title').fill('Bench notes, two editors');
      await anna.getByRole('button', { name: 'Create and open' }).click();
      await anna.waitForURL(/\/notebooks\//);
      const id = new URL(anna.url()).pathname.split('/').pop()!;
      await anna.locator('.nb-page__add [data-testid="add-cell"], .nb-page__empty-actions [data-testid="add-cell"]').first().click();
      await anna.getByRole('menuitem', { name: 'Note – Markdown text' }).click();
      await writeNoteAndSave(anna, 'Anna: torque zero done at 20 °C.');

      await signInAs(ben, server.url, 'admin@ridgeline.test');
      await ben.goto(`${server.url}/notebooks/${id}`);
      await until('Ben to see the note', async () => (await note(ben).inputValue().catch(() => '')) === 'Anna: torque zero done at 20 °C.');

      // Anna saves again; Ben's copy is now one revision behind.
      await writeNoteAndSave(anna, 'Anna: torque zero done at 20 °C, twice.');
      const afterAnna = await revisions(anna, id);
      const annaRevision = afterAnna.at(-1)!.revision;
      expect(afterAnna.at(-1)!.text).toContain('twice.');

      // Ben's save is based on the old revision: 409, and the dialog offers both ways out.
      await writeNoteAndConflict(ben, 'Ben: I think the zero drifted.');
      const dialog = ben.getByRole('dialog', { name: 'This notebook changed on the server' });
      expect(await dialog.textContent()).toContain('Nothing was overwritten');
      expect(await dialog.getByRole('button', { name: "Open the server's version" }).count()).toBe(1);
      expect(await dialog.getByRole('button', { name: 'Keep mine as a new notebook' }).count()).toBe(1);
      await shot(ben, 'conflict-dialog');
      // Nothing was written by the refused save.
      const afterRefusal = await revisions(anna, id);
      expect(afterRefusal.map((r) => r.revision)).toEqual(afterAnna.map((r) => r.revision));
      expect(afterRefusal.map((r) => r.text).join('\n')).not.toContain('Ben:');

      // Choice 1: open the server's version. Ben now sees Anna's text; his edit is gone, nothing saved.
      await dialog.getByRole('button', { name: "Open the server's version" }).click();
      await dialog.waitFor({ state: 'hidden' });
      await until("Ben to see the server's note", async () => (await note(ben).inputValue()) === 'Anna: torque zero done at 20 °C, twice.');
      expect(await ben.locator('[data-save-state]').getAttribute('data-save-state')).toBe('saved');
      const afterReload = await revisions(ben, id);
      expect(afterReload.at(-1)!.revision).toBe(annaRevision);
      expect(afterReload.map((r) => r.text).join('\n')).not.toContain('Ben:');

      // Ben, now up to date, can save again on top of Anna's revision.
      await writeNoteAndSave(ben, 'Ben: zero checked again, fine.');
      const benRevision = annaRevision + 1;
      expect((await revisions(ben, id)).at(-1)).toMatchObject({ revision: benRevision });

      // Anna's copy is now behind: her next save conflicts. Choice 2: keep hers as a new notebook.
      await writeNoteAndConflict(anna, 'Anna: I disagree, redo the zero.');
      const annaDialog = anna.getByRole('dialog', { name: 'This notebook changed on the server' });
      await annaDialog.getByRole('button', { name: 'Keep mine as a new notebook' }).click();
      await anna.waitForURL((url) => url.pathname.startsWith('/notebooks/') && !url.pathname.endsWith(id));
      const copyId = new URL(anna.url()).pathname.split('/').pop()!;
      expect(copyId).not.toBe(id);
      await until("Anna's copy to open with her text", async () => (await note(anna).inputValue().catch(() => '')) === 'Anna: I disagree, redo the zero.');
      const copy = await api<NotebookResponse>(anna, `/api/notebooks/${copyId}`);
      expect(copy.document.title).toBe('Bench notes, two editors (my version)');
      expect(JSON.stringify(copy.document)).toContain('Anna: I disagree, redo the zero.');

      // The shared notebook kept Ben's revision on top; Anna's kept text went only to the copy.
      const original = await revisions(anna, id);
      expect(original.at(-1)!.revision).toBe(benRevision);
      expect(original.at(-1)!.text).toContain('Ben: zero checked again, fine.');
      expect(original.map((r) => r.text).join('\n')).not.toContain('I disagree');
      // Every revision that was ever saved is still there, unchanged.
      for (const r of afterAnna) expect(original.find((o) => o.revision === r.revision)?.text).toBe(r.text);
    } catch (e) {
      await ben.screenshot({ path: join(tmpdir(), 'cogbook-conflict-ben.png'), fullPage: true }).catch(() => undefined);
      await anna.screenshot({ path: join(tmpdir(), 'cogbook-conflict-anna.png'), fullPage: true }).catch(() => undefined);
      throw new Error(`${e instanceof Error ? e.message : String(e)}\nproblems: ${watched.flatMap((w) => w.problems).join('\n')}`);
    }
    // The refused saves show up as failed requests in the console; nothing else may.
    for (const w of watched) expect(w.problems.filter((p) => !/status of 409/.test(p))).toEqual([]);
  }, 300_000);
});
