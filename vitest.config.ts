import { defineConfig } from 'vitest/config';

// One runner for every layer. The API suite runs on in-memory PGlite and, when
// TEST_DATABASE_URL points at a PostgreSQL server, a second time against it.
const pg = process.env.TEST_DATABASE_URL;

export default defineConfig({
  test: {
    projects: [
      { test: { name: 'unit', include: ['tests/unit/**/*.test.ts', 'tests/unit/**/*.test.tsx'], environment: 'node' } },
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      ...(pg
        ? [
            {
              test: {
                name: 'api-postgres',
                include: ['tests/api/**/*.test.ts'],
                environment: 'node',
                testTimeout: 30_000,
                hookTimeout: 60_000,
                fileParallelism: false,
                env: { LASHLINE_TEST_DB: 'postgres' },
              },
            },
          ]
        : []),
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/e2e/global-setup.ts'],
          environment: 'node',
          testTimeout: 90_000,
          hookTimeout: 180_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
