import { defineConfig } from 'vitest/config';

// Browser tests: real Chromium driven by playwright-core against the built app (dist/) served on localhost.
export default defineConfig({
  test: {
    include: ['test/e2e/**/*.test.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 60_000,
    fileParallelism: false,
    // expect.poll waits on a condition; its default 1 s limit would be a hidden timing on a loaded machine.
    // A generous limit, below the 60 s test timeout so a condition that never holds fails with the poll's own message.
    expect: { poll: { timeout: 45_000, interval: 100 } },
  },
});
