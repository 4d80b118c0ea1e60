import { defineConfig } from 'vitest/config';

// Two cores on the bench machines and CI: keep the pool small so ngspice runs and
// child-process tests do not starve each other.
export default defineConfig({
  test: {
    include: ['test/**/*.test.ts', 'test/**/*.test.tsx'],
    setupFiles: ['test/setup.ts'],
    // A throwaway PostgreSQL server for the shared-store tests (test/helpers/pg-global-setup.ts).
    globalSetup: ['test/helpers/pg-global-setup.ts'],
    pool: 'forks',
    maxWorkers: 2,
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
