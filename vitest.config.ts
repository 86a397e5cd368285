import { defineConfig } from 'vitest/config';

// Four suites: pure unit tests, checks against published sources, integration tests against the
// built server on a throw-away SQLite file, and end-to-end tests in Debian's Chromium.
export default defineConfig({
  test: {
    projects: [
      { test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      { test: { name: 'reference', include: ['tests/reference/**/*.test.ts'], environment: 'node' } },
      {
        test: {
          name: 'integration',
          include: ['tests/integration/**/*.test.ts'],
          // *.pg.test.ts: what only holds on PostgreSQL (run by integration-pg below).
          exclude: ['tests/integration/**/*.pg.test.ts'],
          globalSetup: ['tests/helpers/server-setup.ts'],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 120_000,
        },
      },
      {
        // The integration suite again, on PostgreSQL (npm run test:integration:pg starts a throw-away
        // cluster and sets TEST_POSTGRES_URL). Left out: the tests of the SQLite file itself
        // (its backup copy, WAL mode and lock waits, kill -9 during writes).
        test: {
          name: 'integration-pg',
          include: ['tests/integration/**/*.test.ts'],
          exclude: ['tests/integration/backup.test.ts', 'tests/integration/durability.test.ts'],
          globalSetup: ['tests/helpers/server-setup.ts'],
          fileParallelism: false,
          testTimeout: 30_000,
          hookTimeout: 120_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/helpers/server-setup.ts'],
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 180_000,
        },
      },
    ],
  },
});
