import { afterEach, beforeEach, vi } from 'vitest';

// A test that prints an unexpected warning or error fails: such output usually means
// a real problem (a Vue warning, an unhandled rejection logged by a library).
// Tests that expect output spy on console themselves with vi.spyOn, which replaces this.
const unexpected: string[] = [];

beforeEach(() => {
  unexpected.length = 0;
  for (const level of ['warn', 'error'] as const) {
    vi.spyOn(console, level).mockImplementation((...args: unknown[]) => {
      unexpected.push(`console.${level}: ${args.map(String).join(' ')}`);
    });
  }
});

afterEach(() => {
  vi.restoreAllMocks();
  if (unexpected.length > 0) {
    const lines = unexpected.splice(0);
    throw new Error(`Unexpected console output:\n${lines.join('\n')}`);
  }
});
