#!/usr/bin/env node
// Part of `npm run build:node`, after tsc: rebuilds dist/node/server/cli/compare.js as a bundle.
// A command run once per comparison pays for module loading every time: as ~200 separate ES
// modules (zod alone is ~100 files) resolving and compiling them cost about as much CPU as the
// 4 h comparison itself. The bundle is one entry file plus chunks that load on demand (the FIT
// decoder only for FIT input, the schema only for --json), so --help still loads almost nothing.
// Minified: less source for V8 to scan and compile on every start, the same output (no code here
// reads a function's or class's own name: the error classes name themselves).
// Bundled from the TypeScript sources, so the tsc output of the same file is never its input.
import { rm } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'esbuild';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const outdir = join(root, 'dist/node/server/cli');
const chunks = 'compare-chunks';

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

// Chunk names carry a content hash: clear the old ones so stale chunks do not pile up.
await rm(join(outdir, chunks), { recursive: true, force: true });
await build({
  entryPoints: { compare: join(root, 'server/cli/compare.ts') },
  outdir,
  chunkNames: `${chunks}/[name]-[hash]`,
  bundle: true,
  splitting: true,
  format: 'esm',
  platform: 'node',
  target: 'node20',
  sourcemap: true,
  minify: true,
  // CommonJS dependencies that call require() need one in an ES module bundle.
  banner: { js: "import { createRequire as __cogbookRequire } from 'node:module'; const require = __cogbookRequire(import.meta.url);" },
  plugins: [withoutZodLocales],
  logLevel: 'warning',
});
