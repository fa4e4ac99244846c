import { fileURLToPath, URL } from 'node:url';
import vue from '@vitejs/plugin-vue';
import { defineConfig } from 'vite';

const src = (path: string) => fileURLToPath(new URL(`./src/${path}`, import.meta.url));

/**
 * The server's render of the published page (`vite build --config vite.ssr.config.ts`, part of
 * `npm run build:client`): src/published-ssr.ts and the reader's components, built for Node
 * into dist/ssr, so the server answers /p/:slug with the finding already in the HTML. The
 * same components as the browser's build, so the same markup and scoped style ids.
 */
export default defineConfig({
  plugins: [vue()],
  resolve: {
    alias: [
      // No DOM on the server: notes are sanitised by sanitize-html instead of DOMPurify.
      { find: /^dompurify$/, replacement: src('components/snapshot/sanitizeOnServer.ts') },
      { find: /^@\//, replacement: `${src('')}/` },
    ],
  },
  // useMarkdown hands `window` to DOMPurify's factory; the server's stand-in ignores it.
  define: { window: 'globalThis' },
  // Deep imports without file extensions, which Node's own resolver refuses: bundled.
  ssr: { noExternal: ['@ant-design/icons-svg'] },
  build: { ssr: 'src/published-ssr.ts', outDir: 'dist/ssr', emptyOutDir: true, sourcemap: true, target: 'node20' },
});
