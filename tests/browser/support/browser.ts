import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';

/** Chromium flags that work on this machine's closed network (see the contributor guide). */
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium', args: CHROMIUM_ARGS });
}

/**
 * A page that records every console error, page error and CSP violation, so a test can
 * assert there were none. Violations are gathered from `securitypolicyviolation` events
 * and from Chromium's console messages about the Content-Security-Policy.
 */
export interface WatchedPage {
  page: Page;
  context: BrowserContext;
  problems: string[];
}

export async function watchedPage(browser: Browser, options: { width?: number; height?: number } = {}): Promise<WatchedPage> {
  const context = await browser.newContext({ viewport: { width: options.width ?? 1280, height: options.height ?? 860 } });
  // Generous: a cold lazy chunk on a busy two-core machine can take a while.
  context.setDefaultTimeout(60_000);
  const page = await context.newPage();
  const problems: string[] = [];
  // A string, not a function: transpiled test code may reference helpers the page lacks.
  await page.addInitScript(
    "document.addEventListener('securitypolicyviolation', (e) => console.error('CSP violation: ' + e.violatedDirective + ' blocked ' + e.blockedURI));",
  );
  page.on('console', (message) => {
    // A 429 is the sign-in limiter answering a test that signs in often; signInAs waits and retries.
    if (message.type() === 'error' && !message.text().includes('status of 429')) problems.push(`console error: ${message.text()}`);
  });
  page.on('pageerror', (error) => problems.push(`page error: ${error.message}`));
  return { page, context, problems };
}
