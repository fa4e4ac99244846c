import type { Page } from 'playwright-core';

/**
 * What the probe notes in the page, as times on the page's own clock (ms since navigation
 * start, the clock `performance.now()` and event time stamps use).
 */
export interface PageMarks {
  /** Every notebook cell up to date, no run under way, every chart drawn. */
  allFresh?: number;
  /** First output value (a number) in the page. */
  firstValue?: number;
  /** First chart drawn. */
  firstChart?: number;
  /** The published article's head is in the page. */
  article?: number;
  /** First contentful paint, from the paint timing entries. */
  fcp?: number;
}

/** One timed edit, as the probe saw it. */
export interface EditTiming {
  /**
   * The key press that asks for the output (event time stamp) to the edited cell's new output
   * in the page, ms: Shift+Enter when the edit is run at once, else the edit's own key press.
   */
  ms: number;
  /** The edit's own key press to the new output, ms (with Shift+Enter, includes the harness sending that press). */
  fromTypedMs: number;
  /** Longest main-thread task ('longtask' entries, so 0 = none of 50 ms or more) from the edit's key press to the output, ms. */
  longestTaskMs: number;
  /** Longest gap between animation frames in the same span, ms (a finer view of the same blocking). */
  longestFrameGapMs: number;
}

/**
 * The probe, as a string so the page runs it before its own scripts (`addInitScript`) without
 * eval, which the page's policy forbids. It keeps long tasks from a PerformanceObserver and
 * watches the DOM markers the notebook and reader pages set: `[data-cell-id][data-state]`,
 * `[data-running]`, `.chart-view[data-ready]`, `[data-value-name]`.
 */
const PROBE = `(() => {
  if (window.top !== window) return;
  const b = (window.__cbBench = { longTasks: [], marks: {}, expectCells: 0, edit: null });
  try {
    new PerformanceObserver((list) => { for (const e of list.getEntries()) b.longTasks.push([e.startTime, e.duration]); })
      .observe({ type: 'longtask', buffered: true });
  } catch (e) { b.noLongTasks = String(e); }
  const allFresh = () => {
    const cells = document.querySelectorAll('[data-cell-id]');
    if (cells.length === 0 || cells.length < b.expectCells) return false;
    for (const c of cells) if (c.getAttribute('data-state') !== 'fresh') return false;
    const running = document.querySelector('[data-running]');
    if (!running || running.getAttribute('data-running') !== 'false') return false;
    for (const f of document.querySelectorAll('.chart-view')) if (f.getAttribute('data-ready') !== 'true') return false;
    return true;
  };
  const editDone = (e) => {
    const cell = document.querySelector('[data-cell-id="' + e.cellId + '"]');
    if (!cell || Number(cell.getAttribute('data-runs')) <= e.runsBefore || cell.getAttribute('data-state') !== 'fresh') return false;
    const running = document.querySelector('[data-running]');
    return !!running && running.getAttribute('data-running') === 'false';
  };
  const check = () => {
    const now = performance.now();
    const m = b.marks;
    if (m.allFresh === undefined && b.expectCells > 0 && allFresh()) m.allFresh = now;
    if (m.firstValue === undefined && document.querySelector('[data-value-name]')) m.firstValue = now;
    if (m.firstChart === undefined && document.querySelector('.chart-view[data-ready="true"]')) m.firstChart = now;
    if (m.article === undefined && document.querySelector('[data-testid="published-article"]')) m.article = now;
    const e = b.edit;
    if (e && e.start !== undefined && e.done === undefined && editDone(e)) { e.done = now; if (e.resolve) e.resolve(); }
  };
  const watch = () => new MutationObserver(check).observe(document, { subtree: true, childList: true, attributes: true, characterData: true });
  watch();
  document.addEventListener('keydown', (ev) => {
    const e = b.edit;
    if (!e) return;
    if (e.typed === undefined && ev.key === e.key) e.typed = ev.timeStamp;
    if (e.typed !== undefined && e.start === undefined && ev.key === e.trigger) e.start = ev.timeStamp;
  }, true);
  // Arms one edit: the press of key is the edit, the press of trigger (the same key, or the
  // run key after it) starts the clock, and the cell's next fresh output stops it.
  b.arm = (cellId, key, trigger) => {
    const cell = document.querySelector('[data-cell-id="' + cellId + '"]');
    const e = { cellId, key, trigger: trigger || key, runsBefore: Number(cell ? cell.getAttribute('data-runs') : 0), frameGap: 0 };
    b.edit = e;
    let last = performance.now();
    const frame = (t) => {
      if (e.done !== undefined || b.edit !== e) return;
      if (e.typed !== undefined && last >= e.typed) e.frameGap = Math.max(e.frameGap, t - last);
      last = t;
      requestAnimationFrame(frame);
    };
    requestAnimationFrame(frame);
  };
  b.waitEdit = (timeoutMs) => new Promise((resolve, reject) => {
    const e = b.edit;
    const finish = () => {
      clearTimeout(timer);
      const longest = b.longTasks.filter(([s, d]) => s + d > e.typed && s < e.done).reduce((m, [, d]) => Math.max(m, d), 0);
      resolve({ ms: e.done - e.start, fromTypedMs: e.done - e.typed, longestTaskMs: longest, longestFrameGapMs: e.frameGap });
    };
    const timer = setTimeout(() => reject(new Error('edit output not seen within ' + timeoutMs + ' ms (start ' + e.start + ')')), timeoutMs);
    if (e.done !== undefined) finish(); else e.resolve = finish;
  });
  b.read = () => {
    const paint = performance.getEntriesByName('first-contentful-paint')[0];
    return Object.assign({}, b.marks, paint ? { fcp: paint.startTime } : {});
  };
  // Failed cells, with what they say (a waiting cell may only be waiting for its file to load).
  b.stuck = () => [...document.querySelectorAll('[data-cell-id]')]
    .filter((c) => c.getAttribute('data-state') === 'failed')
    .map((c) => c.getAttribute('data-cell-name') + ': ' + ((c.querySelector('.cell-state') || {}).textContent || '').trim() + ' ' + ((c.querySelector('.cell-output') || {}).textContent || '').trim().slice(0, 200));
  b.states = () => [...document.querySelectorAll('[data-cell-id]')].map((c) => c.getAttribute('data-cell-name') + '=' + c.getAttribute('data-state')).join(' ');
  b.longestTask = (from, to) => b.longTasks.filter(([s, d]) => s + d > from && s < to).reduce((m, [, d]) => Math.max(m, d), 0);
})();`;

/** Installs the probe in every document the page opens; `expectCells` = how many cells make the notebook complete. */
export async function installProbe(page: Page, expectCells = 0): Promise<void> {
  await page.addInitScript(PROBE);
  if (expectCells > 0) await page.addInitScript(`window.__cbBench && (window.__cbBench.expectCells = ${expectCells});`);
}

interface ProbeApi {
  marks: PageMarks;
  read: () => PageMarks;
  arm: (cellId: string, key: string, trigger?: string) => void;
  waitEdit: (timeoutMs: number) => Promise<EditTiming>;
  longestTask: (from: number, to: number) => number;
  stuck: () => string[];
  states: () => string;
  noLongTasks?: string;
}

/** The page's global object as the probe's functions see it (this code is typed for Node, without the DOM). */
type ProbeGlobal = { __cbBench?: ProbeApi };

/** Polls until `mark` is set, then returns the marks; throws after `timeoutMs`. */
export async function waitForMark(page: Page, mark: keyof PageMarks, timeoutMs: number): Promise<PageMarks> {
  const deadline = Date.now() + timeoutMs;
  let stuckSince: number | undefined;
  for (;;) {
    const { marks, stuck, states } = await page.evaluate(() => {
      const b = (globalThis as ProbeGlobal).__cbBench;
      return { marks: b?.read() ?? {}, stuck: b?.stuck() ?? [], states: b?.states() ?? '' };
    });
    if (marks[mark] !== undefined) return marks;
    // A failed cell may still turn (an input that changed late): give it a while, then say which.
    stuckSince = stuck.length === 0 ? undefined : (stuckSince ?? Date.now());
    if (stuckSince !== undefined && Date.now() - stuckSince > 60_000) throw new Error(`cells that do not compute: ${stuck.join('; ')}`);
    if (Date.now() > deadline) throw new Error(`page did not reach "${mark}" within ${timeoutMs / 1000} s (marks ${JSON.stringify(marks)}; cells ${states})`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

/** Longest long task in the page between two of its times, ms (0 = none of 50 ms or more). */
export async function longestTask(page: Page, from: number, to: number): Promise<number> {
  return page.evaluate(([f, t]) => (globalThis as ProbeGlobal).__cbBench?.longestTask(f!, t!) ?? NaN, [from, to]);
}

/** Whether the browser reports long tasks at all (else the long-task figures mean nothing). */
export async function longTasksSupported(page: Page): Promise<boolean> {
  return page.evaluate(() => {
    const b = (globalThis as ProbeGlobal).__cbBench;
    return b !== undefined && b.noLongTasks === undefined && (PerformanceObserver as unknown as { supportedEntryTypes: string[] }).supportedEntryTypes.includes('longtask');
  });
}

/** Arms the probe for one edit of `cellId` made by pressing `key`, timed from the press of `trigger` (default: `key`). */
export async function armEdit(page: Page, cellId: string, key: string, trigger?: string): Promise<void> {
  await page.evaluate(([id, k, t]) => (globalThis as ProbeGlobal).__cbBench?.arm(id!, k!, t), [cellId, key, trigger] as const);
}

/** Waits for the armed edit's output and returns its timing. */
export async function editTiming(page: Page, timeoutMs: number): Promise<EditTiming> {
  return page.evaluate((t) => {
    const b = (globalThis as ProbeGlobal).__cbBench;
    if (!b) throw new Error('probe not installed');
    return b.waitEdit(t);
  }, timeoutMs);
}
