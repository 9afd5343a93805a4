import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

/**
 * Server, shared and fake specs run in Node. The browser suite drives Debian's Chromium
 * through playwright-core, so it runs on its own, one file at a time.
 */
export default defineConfig({
  // The `@shared/*` path alias of tsconfig.json; each project inherits it (`extends: true`).
  resolve: { alias: { '@shared': fileURLToPath(new URL('./shared', import.meta.url)) } },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          environment: 'node',
          include: [
            '{shared,server,fakes}/**/*.{spec,test}.ts',
            'web/**/*.spec.ts',
            'scripts/**/*.spec.ts',
          ],
        },
      },
      {
        extends: true,
        test: {
          name: 'api',
          environment: 'node',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});
