import { expect } from 'vitest';

/**
 * Number of correct significant digits of `actual` against a certified value, the
 * "log relative error" NIST StRD uses (McCullough 1998): -log10(|actual - c| / |c|).
 */
export function correctDigits(actual: number, certified: number): number {
  if (actual === certified) return Infinity;
  return -Math.log10(Math.abs(actual - certified) / Math.abs(certified));
}

/** Asserts that `actual` agrees with `certified` to at least `digits` significant digits. */
export function expectDigits(actual: number, certified: number | string, digits: number): void {
  const c = typeof certified === 'string' ? Number(certified) : certified;
  expect(Number.isFinite(actual), `expected a finite value near ${c}, got ${actual}`).toBe(true);
  const got = correctDigits(actual, c);
  expect(got, `${actual} vs certified ${c}: ${got.toFixed(1)} digits, want ${digits}`).toBeGreaterThanOrEqual(digits);
}

/** Float64Array from NIST's printed decimal strings. */
export function numbers(values: readonly (string | number)[]): Float64Array {
  return Float64Array.from(values, Number);
}
