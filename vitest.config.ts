import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    reporters: ['default', './test/summary-reporter.ts'],
    // CLI and browser tests start real processes; two cores, so keep the pool small.
    pool: 'forks',
    maxWorkers: 2,
    // Every test under 60 s (a build shared by a file's tests runs in its beforeAll).
    testTimeout: 60_000,
    hookTimeout: 120_000,
  },
});
