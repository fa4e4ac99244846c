import type { Page } from 'playwright-core';

/** The seeded demo accounts' password (printed by the server at first start). */
export const DEMO_PASSWORD = 'cogbook-demo';

/**
 * Signs in through the real form and waits for the library. The server runs in production
 * mode, where the account library allows only a few sign-ins per address in a short window:
 * when the form reports a refusal, wait out the window and try again (at most three times).
 */
export async function signInAs(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD): Promise<void> {
  for (let attempt = 1; ; attempt++) {
    await page.goto(`${baseUrl}/sign-in`);
    await page.locator('#sign-in-email').fill(email);
    await page.locator('#sign-in-password').fill(password);
    await page.getByRole('button', { name: 'Sign in', exact: true }).click();
    const outcome = await Promise.race([
      page.waitForURL(/\/library$/).then(() => 'in' as const),
      page.getByRole('alert').first().waitFor().then(() => 'refused' as const),
    ]);
    if (outcome === 'in') return;
    if (attempt >= 3) throw new Error(`sign-in as ${email} refused: ${await page.getByRole('alert').first().innerText()}`);
    await page.waitForTimeout(11_000);
  }
}
