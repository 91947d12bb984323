import { defineConfig } from 'vitest/config';

// Browser tests: real Chromium driven by playwright-core against the built app (dist/) served on localhost.
export default defineConfig({
  test: {
    include: ['test/e2e/**/*.test.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
