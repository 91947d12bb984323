import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    exclude: ['test/e2e/**', 'test/crosscheck/**', 'node_modules/**'],
    environment: 'node',
    setupFiles: ['test/setup.ts'],
    testTimeout: 60_000,
  },
});
