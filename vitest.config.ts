import { defineConfig } from 'vitest/config';

// One config, several projects: `unit` (pure core, fast), `reference` (checks against outside
// references such as CVXOPT and GDAL; needs the Debian packages that .ci/run installs).
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
    ],
  },
});
