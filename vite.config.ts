/// <reference types="vitest/config" />
import { fileURLToPath, URL } from 'node:url';
import vue from '@vitejs/plugin-vue';
import { defineConfig, type Plugin } from 'vite';

const apiPort = Number(process.env.PORT ?? 3000);

/**
 * Links the style sheets of the chunks published.html's entry loads by a dynamic import
 * (and of what those import statically) into published.html itself, as Vite does for the
 * entry's own: the server writes them into the page, so its server-drawn markup is styled
 * from the first paint rather than once the view's code arrives.
 */
function readerStylesInPage(): Plugin {
  return {
    name: 'cogbook:reader-styles-in-page',
    apply: 'build',
    transformIndexHtml: {
      order: 'post',
      handler(html, { filename, bundle, chunk }) {
        if (!filename.endsWith('published.html') || !bundle || !chunk) return html;
        const sheets = new Set<string>();
        const seen = new Set<string>();
        const visit = (file: string) => {
          const found = bundle[file];
          if (seen.has(file) || found?.type !== 'chunk') return;
          seen.add(file);
          for (const css of found.viteMetadata?.importedCss ?? []) sheets.add(css);
          for (const imported of found.imports) visit(imported);
        };
        for (const loaded of chunk.dynamicImports) visit(loaded);
        const tags = [...sheets]
          .filter((css) => !html.includes(`/${css}"`))
          .map((css) => ({ tag: 'link', attrs: { rel: 'stylesheet', crossorigin: true, href: `/${css}` }, injectTo: 'head' as const }));
        return { html, tags };
      },
    },
  };
}

export default defineConfig({
  plugins: [vue(), readerStylesInPage()],
  resolve: {
    alias: { '@': fileURLToPath(new URL('./src', import.meta.url)) },
  },
  server: {
    port: 5173,
    proxy: { '/api': { target: `http://127.0.0.1:${apiPort}`, changeOrigin: false } },
  },
  optimizeDeps: { include: ['mathjs', 'comlink'] },
  worker: { format: 'es' },
  build: {
    outDir: 'dist/client',
    emptyOutDir: true,
    sourcemap: true,
    chunkSizeWarningLimit: 6000,
    // The app, and the published page's own small entry for signed-out readers.
    rollupOptions: { input: { main: 'index.html', published: 'published.html' } },
  },
  test: {
    setupFiles: ['tests/setup/fail-on-console.ts'],
    projects: [
      {
        extends: true,
        test: { name: 'unit', environment: 'node', include: ['tests/shared/**/*.spec.ts', 'tests/workers/**/*.spec.ts'] },
      },
      {
        extends: true,
        test: { name: 'component', environment: 'happy-dom', include: ['tests/src/**/*.spec.ts'] },
      },
      {
        extends: true,
        test: {
          name: 'api',
          environment: 'node',
          include: ['tests/server/**/*.spec.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        extends: true,
        test: {
          name: 'browser',
          environment: 'node',
          include: ['tests/browser/**/*.spec.ts'],
          testTimeout: 120_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
      {
        extends: true,
        test: {
          name: 'security',
          environment: 'node',
          include: ['tests/security/**/*.spec.ts'],
          testTimeout: 300_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
      {
        extends: true,
        test: {
          // Long crash loops: only `npm run test:stress` sets COGBOOK_STRESS, so a plain `vitest run` skips them.
          name: 'stress',
          environment: 'node',
          include: process.env.COGBOOK_STRESS === '1' ? ['tests/stress/**/*.spec.ts'] : ['tests/stress/no-stress-without-COGBOOK_STRESS'],
          testTimeout: 2_000_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
