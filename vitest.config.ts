import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    // The browser test needs the built package and Chromium: `npm run test:browser`,
    // run by .ci/run after the build.
    exclude: ['test/browser/**', 'node_modules/**'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'threads',
  },
});
