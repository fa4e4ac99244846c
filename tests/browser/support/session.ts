import type { Page } from 'playwright-core';

/** The seeded demo accounts' password (printed by the server at first start). */
export const DEMO_PASSWORD = 'cogbook-demo';

/** Signs in through the real form and waits for the library. */
export async function signInAs(page: Page, baseUrl: string, email: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${baseUrl}/sign-in`);
  await page.locator('#sign-in-email').fill(email);
  await page.locator('#sign-in-password').fill(password);
  await page.getByRole('button', { name: 'Sign in', exact: true }).click();
  await page.waitForURL(/\/library$/);
}
