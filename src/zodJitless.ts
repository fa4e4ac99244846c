// zod builds its object parsers at schema creation and, unless told not to, first probes
// `new Function`. The page's CSP (script-src 'self', no 'unsafe-eval') blocks the probe and
// reports a violation on every page that loads a schema. This module is imported first in
// main.ts so the setting exists before any schema module runs; zod reads it from here.
const holder = globalThis as { __zod_globalConfig?: Record<string, unknown> };
holder.__zod_globalConfig = { ...holder.__zod_globalConfig, jitless: true };

export {};
