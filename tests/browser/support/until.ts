/**
 * Polls a check from the test side until it holds. Predicates passed into the page as
 * strings would need eval, which the product's content security policy forbids.
 */
export async function until(what: string, check: () => Promise<boolean>, timeoutMs = 60_000, everyMs = 150): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
