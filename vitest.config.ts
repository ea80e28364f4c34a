import { defineConfig } from 'vitest/config';

/**
 * Two test projects:
 *  - `node`: everything that needs nothing but Node (`npm test`);
 *  - `system`: suites that need Debian packages (chromium for the browser, python3-vtk9 for
 *    re-running the VTK reference scripts), run by `npm run test:system`.
 */
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'node',
          include: ['tests/**/*.test.ts'],
          exclude: ['tests/system/**', 'node_modules/**'],
          environment: 'node',
          testTimeout: 60_000,
          hookTimeout: 60_000,
          pool: 'forks',
        },
      },
      {
        test: {
          name: 'system',
          include: ['tests/system/**/*.test.ts'],
          environment: 'node',
          testTimeout: 180_000,
          hookTimeout: 180_000,
          pool: 'forks',
          fileParallelism: false,
        },
      },
    ],
  },
});
