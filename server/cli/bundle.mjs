#!/usr/bin/env node
// Part of `npm run build:node`, after tsc: rebuilds dist/node/server/cli/compare.js as a bundle.
// A command run once per comparison pays for module loading every time: as ~200 separate ES
// modules (zod alone is ~100 files) resolving and compiling them cost about as much CPU as the
// 4 h comparison itself. The bundle is one CommonJS file, compare-bundle.cjs, which compare.js
// loads with require(): ES modules, even a dozen chunks, go through Node's asynchronous module
// loader one job each, and that cost more than reading one file (a 4 h FIT pair at load 4-5:
// 10-30 % less wall time than an ES module entry with chunks; --help, which now scans the whole
// file, ~20 ms more). Its parts still start on demand (esbuild turns each dynamic import into a
// module that runs when first imported: the FIT reader only for FIT input, the report check only
// for --json). The report schema goes in as JSON Schema, made here from the zod schema (tsc's
// output of it), so --json checks its document with a plain function instead of loading zod
// (about 20 ms of a FIT pair's start-up; CSV input still loads zod for its column mapping). The two libraries a comparison may not need stay outside it: fit-file-parser (only for
// a FIT file Cogbook's own decoder leaves to it) and papaparse (only for CSV input).
// Minified: less source for V8 to scan and compile on every start, the same output (no code here
// reads a function's or class's own name: the error classes name themselves).
// Bundled from the TypeScript sources, so the tsc output of the same file is never its input.
import { rm, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';
import { z } from 'zod';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const outdir = join(root, 'dist/node/server/cli');

/**
 * zod re-exports every message locale (~370 kB of the bundle) as `z.locales`; the command only
 * uses the English messages zod installs itself, so the re-export becomes an empty namespace.
 */
const withoutZodLocales = {
  name: 'without-zod-locales',
  setup(b) {
    b.onResolve({ filter: /^\.\.\/locales\/index\.js$/ }, (args) => (args.importer.includes(`${join('node_modules', 'zod')}`) ? { path: 'zod-locales', namespace: 'empty' } : undefined));
    b.onLoad({ filter: /.*/, namespace: 'empty' }, () => ({ contents: 'export {};', loader: 'js' }));
  },
};

/** The two libraries left out of the bundle, by their exact names (fit-file-parser/profile, small, stays in). */
const leftOut = {
  name: 'left-out',
  setup(b) {
    b.onResolve({ filter: /^(fit-file-parser|papaparse)$/ }, (args) => ({ path: args.path, external: true }));
  },
};

// Left over from builds that split the bundle into ES module chunks, and tsc's map of compare.js.
await rm(join(outdir, 'compare-chunks'), { recursive: true, force: true });
await rm(join(outdir, 'compare.js.map'), { force: true });
const { compareReportSchema } = await import(join(root, 'dist/node/shared/engine/compare-report.js'));
await build({
  entryPoints: [join(root, 'server/cli/compare.ts')],
  define: { COMPARE_REPORT_JSON_SCHEMA: JSON.stringify(JSON.stringify(z.toJSONSchema(compareReportSchema))) },
  outfile: join(outdir, 'compare-bundle.cjs'),
  bundle: true,
  format: 'cjs',
  platform: 'node',
  target: 'node20',
  sourcemap: true,
  minify: true,
  plugins: [withoutZodLocales, leftOut],
  logLevel: 'warning',
});
// compare.js is an ES module (the package's "type"), so it stays the path users and scripts run.
await writeFile(join(outdir, 'compare.js'), "import { createRequire } from 'node:module';\n\ncreateRequire(import.meta.url)('./compare-bundle.cjs');\n");
