import type { BrowserContext, Page } from 'playwright-core';
import { EDITED_CELL_ID } from './bench-notebook.js';
import { armEdit, editTiming, installProbe, longestTask, waitForMark, type EditTiming } from './page-probe.js';

/** One open of a notebook page, timed by the page's own clock. */
export interface OpenTiming {
  /** Navigation start to every cell up to date and every chart drawn, ms. */
  ms: number;
  /** Longest main-thread task during that span, ms (0 = none of 50 ms or more). */
  longestTaskMs: number;
}

/** How long one open may take: three 4 h 10 Hz recordings on a busy two-core machine. */
const OPEN_TIMEOUT_MS = 15 * 60_000;
const EDIT_TIMEOUT_MS = 3 * 60_000;

/** Opens a notebook in a new page of `context` and waits until it is complete; the page stays open. */
export async function openNotebook(context: BrowserContext, url: string, cells: number): Promise<{ page: Page; timing: OpenTiming }> {
  const page = await context.newPage();
  await installProbe(page, cells);
  await page.goto(url, { timeout: OPEN_TIMEOUT_MS });
  const marks = await waitForMark(page, 'allFresh', OPEN_TIMEOUT_MS);
  const ms = marks.allFresh!;
  return { page, timing: { ms, longestTaskMs: await longestTask(page, 0, ms) } };
}

/** Waits until the page's code editor for the edited cell has loaded (it loads lazily). */
export async function editorReady(page: Page): Promise<void> {
  await page.locator(`[data-cell-id="${EDITED_CELL_ID}"] [data-editor="ready"]`).waitFor({ timeout: 180_000 });
}

/**
 * One edit of the benchmark formula: the cursor goes to the end of its first line
 * (`pedal_min = N`), the digit is selected, and one key press replaces it. With `runAtOnce`,
 * Shift+Enter follows (the notebook's "run now"); without, the notebook runs by itself after
 * its typing pause. Timed to the cell's new output from the press that asks for it:
 * Shift+Enter, or the digit when the notebook runs by itself. (Playwright sends Shift+Enter
 * only after the digit's press has been handled, tens of ms later on a busy machine: that gap
 * is the harness, not the product, and is left out; the longest-task figure covers it.)
 */
export async function editOnce(page: Page, digit: string, runAtOnce: boolean): Promise<EditTiming> {
  await page.locator(`[data-cell-id="${EDITED_CELL_ID}"] .monaco-editor .view-lines`).click();
  await page.keyboard.press('Control+Home');
  await page.keyboard.press('End');
  await page.keyboard.press('Shift+ArrowLeft');
  await armEdit(page, EDITED_CELL_ID, digit, runAtOnce ? 'Enter' : digit);
  await page.keyboard.press(digit);
  if (runAtOnce) await page.keyboard.press('Shift+Enter');
  const timing = await editTiming(page, EDIT_TIMEOUT_MS);
  // A short rest, so one edit's after-work (the autosave's answer) rarely lands in the next.
  await page.waitForTimeout(200);
  return timing;
}
