import { copyFileSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Browser, Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { crcFailingFit, notFitBytes, smallFit, truncatedFit } from '../fixtures/bad-fit.js';
import { launchBrowser, watchedPage, type WatchedPage } from './support/browser.js';
import { startServer, type RunningServer } from './support/server.js';
import { signInAs } from './support/session.js';
import { until } from './support/until.js';

// A small upload limit so an ordinary file can be "too large" (the server reads it from UPLOAD_LIMIT_MB).
// (A whole number of bytes: multer refuses a fractional fileSize, e.g. from 0.05 MB.)
const LIMIT_MB = 0.0625;
const LIMIT_TEXT = '64 KB'; // 0.0625 MB x 1024 KB per MB

let server: RunningServer;
let browser: Browser;
let dir: string;
const file = (name: string) => join(dir, name);

/**
 * Each bad file, what its message on the import cell must say (what is wrong and where: the file,
 * and the byte, row, column or field), and whether the file can be read past its damage.
 */
const BAD: { name: string; expect: RegExp[]; damaged?: boolean; state?: string }[] = [
  { name: 'empty.fit', expect: [/^empty\.fit is empty \(0 bytes\)/] },
  { name: 'holiday-photo.fit', expect: [/^holiday-photo\.fit is named \.fit but is not a FIT file/, /signature "\.FIT" at bytes 8-11/, /at byte \d+/] },
  { name: 'cut-short.fit', expect: [/^cut-short\.fit is cut short/, /the file ends at byte \d+ \(expected \d+\)/, /read damaged file/], damaged: true },
  { name: 'no-power.fit', expect: [/^no-power\.fit has no power: none of its records has a power field/] },
  { name: 'three-records.fit', expect: [/^three-records\.fit holds only 3 samples; at least 10 are needed/] },
  { name: 'no-numbers.csv', expect: [/^no-numbers\.csv: none of its 3 columns holds numbers \(checked rows 2-4\)/] },
  { name: 'no-time.csv', expect: [/^no-time\.csv: no column holds the time/, /"power \(W\)", "cadence \(rpm\)"/], state: 'needs-mapping' },
  { name: 'two-power-units.csv', expect: [/^two-power-units\.csv: columns "power \(W\)" \(W\) and "power \(kW\)" \(kW, row 1, column 3\) both hold power in different units/], state: 'needs-mapping' },
  { name: 'power-unit-unknown.csv', expect: [/^power-unit-unknown\.csv: the unit of power column "power \[hp\]" \(row 1, column 2\) cannot be decided/], state: 'needs-mapping' },
  { name: 'header-only.csv', expect: [/^header-only\.csv has a header row \(row 1\) but no data rows after it \(row 2 is missing\)/] },
  { name: 'three-rows.csv', expect: [/^three-rows\.csv holds only 3 samples/] },
  { name: 'big-ride.csv', expect: [new RegExp(`^big-ride\\.csv \\(\\d+(\\.\\d)? KB\\) is larger than the server's upload limit of ${LIMIT_TEXT} per file`)] },
];

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'cogbook-bad-files-'));
  const good = smallFit({ count: 300, seed: 21 });
  writeFileSync(file('reference-hub.fit'), good);
  writeFileSync(file('empty.fit'), new Uint8Array());
  writeFileSync(file('holiday-photo.fit'), notFitBytes());
  writeFileSync(file('cut-short.fit'), truncatedFit(smallFit({ seed: 22 })));
  writeFileSync(file('checksum-fails.fit'), crcFailingFit({ seed: 23 }));
  writeFileSync(file('no-power.fit'), smallFit({ power: false, seed: 24 }));
  writeFileSync(file('three-records.fit'), smallFit({ count: 3, seed: 25 }));
  for (const name of ['no-numbers.csv', 'no-time.csv', 'two-power-units.csv', 'power-unit-unknown.csv', 'header-only.csv', 'three-rows.csv']) {
    copyFileSync(join('tests/fixtures/bad', name), file(name));
  }
  // A well-formed ride, just over the limit: 1 Hz for a few hours.
  const rows = ['time (s),power (W),cadence (rpm)'];
  for (let t = 0; rows.join('\n').length < LIMIT_MB * 1024 * 1024 * 1.5; t++) rows.push(`${t},${200 + (t % 37)},${85 + (t % 9)}`);
  writeFileSync(file('big-ride.csv'), rows.join('\n'));

  const seeded = process.env['COGBOOK_BROWSER_DATA_DIR'];
  [server, browser] = await Promise.all([startServer({ UPLOAD_LIMIT_MB: String(LIMIT_MB), ...(seeded ? { DATA_DIR: seeded } : {}) }), launchBrowser()]);
});

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  rmSync(dir, { recursive: true, force: true });
});

let formulaName = '';
const cell = (page: Page, name: string): Locator => page.locator(`[data-cell-name="${name}"]`);

async function upload(page: Page, name: string): Promise<void> {
  await cell(page, 'dut').locator('[data-slot="test"] input[type=file]').first().setInputFiles(file(name));
}

/** The rest of the notebook: the reference cell is computed and the formula on it still shows its value. */
async function restStillWorks(page: Page, mean: string): Promise<void> {
  expect(await cell(page, 'ref').getAttribute('data-state')).toBe('fresh');
  expect(await page.locator('[data-value-name="ref_mean"]').textContent()).toBe(mean);
  expect(await cell(page, formulaName).getAttribute('data-state')).toBe('fresh');
}

describe('bad files on an import cell', () => {
  let watched: WatchedPage;

  it('names what is wrong and where for each bad file, while the rest of the notebook keeps working', async () => {
    watched = await watchedPage(browser);
    const { page } = watched;
    await page.addInitScript('globalThis.__name = (f) => f');
    page.on('dialog', (d) => void d.accept());
    // A refused upload (413 too large, 415 not a usable file) is an answer the page shows; the browser also logs it as a failed request.
    const expectedConsole = (p: string) => /status of 41[35]/.test(p);

    await signInAs(page, server.url, 'analyst@ridgeline.test');
    await page.getByRole('button', { name: 'New notebook' }).click();
    await page.locator('#new-notebook-title').fill('Bad files on the bench');
    await page.getByRole('button', { name: 'Create and open' }).click();
    await page.waitForURL(/\/notebooks\//);
    const dut = cell(page, 'dut');
    const error = dut.locator('.slot-file__error');
    try {
      await page.getByRole('button', { name: 'Add the two recordings' }).click();
      await cell(page, 'ref').locator('[data-slot="reference"] input[type=file]').first().setInputFiles(file('reference-hub.fit'));
      await until('the reference to be read', async () => (await cell(page, 'ref').getAttribute('data-state')) === 'fresh');

      await page.locator('.nb-page__add [data-testid="add-cell"]').click();
      await page.getByRole('menuitem', { name: 'Formula – compute numbers' }).click();
      const formula = page.locator('[data-kind="formula"]').last();
      await formula.locator('[data-editor="ready"]').waitFor({ timeout: 90_000 });
      await formula.locator('.monaco-editor .view-lines').click();
      await page.keyboard.insertText('ref_mean = round(mean(ref.power), 3)');
      await until('the formula to compute', async () => (await page.locator('[data-value-name="ref_mean"]').count()) > 0 && (await formula.getAttribute('data-state')) === 'fresh');
      formulaName = (await formula.getAttribute('data-cell-name')) ?? '';
      const mean = (await page.locator('[data-value-name="ref_mean"]').textContent()) ?? '';
      expect(Number(mean)).toBeGreaterThan(200);

      for (const bad of BAD) {
        await upload(page, bad.name);
        await until(`the message for ${bad.name}`, async () => (await error.count()) === 1 && (await error.textContent())?.startsWith(bad.name) === true);
        const text = (await error.textContent()) ?? '';
        for (const pattern of bad.expect) expect(text, bad.name).toMatch(pattern);
        expect(await dut.locator('[data-slot="test"]').getAttribute('data-slot-state'), bad.name).toBe(bad.state ?? 'failed');
        expect(await dut.locator('[data-testid="read-damaged"]').count(), bad.name).toBe(bad.damaged ? 1 : 0);
        // The failed file leaves the import cell without a recording, never with the previous file's.
        await until(`the cell to drop its recording after ${bad.name}`, async () => (await dut.getAttribute('data-state')) !== 'fresh');
        await restStillWorks(page, mean);
        if (bad.name === 'empty.fit') await shots(page, dut, 'bad-file-empty');
      }

      // A file whose checksum fails: the message offers to read what is readable, and doing so imports it with a warning.
      await upload(page, 'checksum-fails.fit');
      await until('the checksum message', async () => (await error.textContent())?.startsWith('checksum-fails.fit') === true);
      expect(await error.textContent()).toMatch(/^checksum-fails\.fit: the FIT file checksum fails \(bytes \d+-\d+\), so some bytes changed after it was written\. Reading it anyway \("read damaged file"\) keeps whatever records are intact\./);
      await shots(page, dut, 'bad-file-checksum');
      const readDamaged = dut.locator('[data-testid="read-damaged"]');
      expect(await readDamaged.textContent()).toContain('Read damaged file');
      await readDamaged.click();
      await until('the damaged file to be read', async () => (await dut.getAttribute('data-state')) === 'fresh');
      expect(await error.count()).toBe(0);
      const warnings = (await dut.locator('.cell-warnings').textContent()) ?? '';
      expect(warnings).toMatch(/checksum-fails\.fit: the FIT file checksum fails \(bytes \d+-\d+\).*Read anyway: records after the damage may be missing or wrong\./);
      // smallFit wrote 120 records; the changed byte is a field value, so every record is still there.
      expect((await dut.locator('.cell-import__facts').textContent())?.replace(/\s+/g, ' ')).toMatch(/Samples\s*120 every 1 s/);
      await shots(page, dut, 'bad-file-read-damaged');
      await restStillWorks(page, mean);

      // And the notebook still computes: an edit to the formula recomputes it.
      await formula.locator('.monaco-editor .view-lines').click();
      await page.keyboard.press('End');
      await page.keyboard.insertText('\nn_test = count(dut.power)');
      await until('the formula to recompute with the damaged file', async () => (await page.locator('[data-value-name="n_test"]').count()) > 0 && (await formula.getAttribute('data-state')) === 'fresh');
      expect(await page.locator('[data-value-name="n_test"]').textContent()).toBe('120');
    } catch (e) {
      await page.screenshot({ path: join(tmpdir(), 'cogbook-bad-files-failure.png'), fullPage: true }).catch(() => undefined);
      const cells = await page.locator('[data-cell-id]').evaluateAll((els) => els.map((el) => `${(el as HTMLElement).dataset['cellName']}=${(el as HTMLElement).dataset['state']}: ${(el.textContent ?? '').replace(/\s+/g, ' ').slice(0, 400)}`)).catch(() => []);
      throw new Error(`${e instanceof Error ? e.message : String(e)}\ncells:\n${cells.join('\n')}\ndut cell: ${await dut.textContent().catch(() => '?')}\nproblems: ${watched.problems.join('\n')}`);
    }
    expect(watched.problems.filter((p) => !expectedConsole(p))).toEqual([]);
  }, 400_000);
});

/** With COGBOOK_SHOTS=dir, a picture of the import cell for a human to look at. */
async function shots(page: Page, target: Locator, name: string): Promise<void> {
  const out = process.env['COGBOOK_SHOTS'];
  if (!out) return;
  mkdirSync(out, { recursive: true });
  await target.scrollIntoViewIfNeeded();
  await target.screenshot({ path: join(out, `${name}.png`) });
  await page.screenshot({ path: join(out, `${name}-page.png`) });
}
