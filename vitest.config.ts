import { defineConfig } from 'vitest/config';

// Two projects: `unit` needs nothing running; `integration` (and the browser tests) get a real
// PostgreSQL database, S3 fake, SMTP fake and a built server from tests/global-setup.ts.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
          // Two cores shared by many jobs: a test that takes 1 s alone can take 10 s here. Speed
          // is shown by the benchmarks, never by a test's clock.
          testTimeout: 30_000,
        },
      },
      {
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts', 'tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/global-setup.ts'],
          setupFiles: ['tests/setup-env.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
          // One server and database for all files: run the files one after another.
          pool: 'forks',
          poolOptions: { forks: { singleFork: true } },
        },
      },
    ],
  },
});
