// Vite builds the client; Vitest runs every suite. The API and the client share one port in
// production (Express serves dist/); in development Vite proxies /api to Express.
import { fileURLToPath, URL } from 'node:url';
import { defineConfig } from 'vitest/config';
import vue from '@vitejs/plugin-vue';
import vuetify from 'vite-plugin-vuetify';

const apiPort = Number(process.env.PORT ?? 3000);

export default defineConfig({
  plugins: [vue(), vuetify({ autoImport: true })],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  server: {
    proxy: { '/api': `http://127.0.0.1:${apiPort}` },
  },
  build: { outDir: 'dist', chunkSizeWarningLimit: 1500 },
  test: {
    projects: [
      {
        // Pure computation: the flow engine, geometry, models. Runs in parallel.
        extends: true,
        test: { name: 'unit', include: ['tests/shared/**/*.test.ts'], environment: 'node' },
      },
      {
        // Client logic (stores, components) in a simulated DOM.
        extends: true,
        test: { name: 'client', include: ['tests/client/**/*.test.ts'], environment: 'happy-dom' },
      },
      {
        // API tests with supertest against the real PostgreSQL; each file gets its own
        // database cloned from a migrated template (tests/server/support/database.ts).
        extends: true,
        test: {
          name: 'api',
          include: ['tests/server/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/server/support/global-setup.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        // Browser tests: the real server and Debian's Chromium through playwright-core.
        extends: true,
        test: {
          name: 'browser',
          include: ['tests/browser/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/server/support/global-setup.ts'],
          testTimeout: 120_000,
          hookTimeout: 120_000,
          fileParallelism: false,
          // A real browser against a real server on a 2-core machine: one slow navigation should
          // not fail the suite; a test that fails three times in a row still does.
          retry: 2,
        },
      },
    ],
  },
});
