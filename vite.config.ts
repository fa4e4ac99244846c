/// <reference types="vitest/config" />
import { fileURLToPath, URL } from 'node:url';
import vue from '@vitejs/plugin-vue';
import { defineConfig } from 'vite';

const apiPort = Number(process.env.PORT ?? 3000);

export default defineConfig({
  plugins: [vue()],
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
