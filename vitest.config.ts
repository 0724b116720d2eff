import { defineConfig } from 'vitest/config';

// One config, several projects: `unit` (pure core, fast), `reference` (checks against outside
// references such as CVXOPT and GDAL: Debian packages that `npm test` installs or names first, see
// bin/ensure-test-tools.mjs), `e2e` (builds the renderer, serves it with vite preview, drives Debian
// chromium with playwright-core). A missing reference tool fails a CI=true run (test/support/reference-tools.ts).
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['test/unit/**/*.test.ts'],
          environment: 'node',
          testTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'reference',
          include: ['test/reference/**/*.test.ts'],
          environment: 'node',
          testTimeout: 300_000,
          hookTimeout: 300_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.e2e.test.ts'],
          environment: 'node',
          globalSetup: ['test/e2e/global-setup.ts'],
          // One browser, tests in order: they share a page and the machine has two cores.
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});
