import { defineConfig } from 'vitest/config';

// Cross-check against ngspice (a reference in tests only, never part of the app).
export default defineConfig({
  test: {
    include: ['test/crosscheck/**/*.test.ts'],
    environment: 'node',
    testTimeout: 120_000,
  },
});
