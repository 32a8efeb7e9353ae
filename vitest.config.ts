import { defineConfig } from 'vitest/config'

/**
 * Three projects: `unit` (the engine and pure logic, plain Node), `api` (routes against the
 * built server), `e2e` (real Chromium against the same server). `api` and `e2e` share one
 * server, started by tests/support/server-setup.ts.
 */
export default defineConfig({
  test: {
    projects: [
      {
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' },
      },
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/support/server-setup.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/support/server-setup.ts'],
          testTimeout: 90_000,
          hookTimeout: 90_000,
          // One browser at a time on a 2-core machine.
          fileParallelism: false,
        },
      },
    ],
  },
})
