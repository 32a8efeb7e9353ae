import { defineConfig } from 'vitest/config'

/**
 * Three projects: `unit` (the engine and pure logic, plain Node), `api` (routes against the
 * built server), `e2e` (real Chromium against it). The app is built and a template database
 * seeded once (tests/support/global-setup.ts); each api and e2e file starts its own server on
 * its own copy of that database (tests/support/file-server.ts).
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
          globalSetup: ['tests/support/global-setup.ts'],
          setupFiles: ['tests/support/file-server.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          setupFiles: ['tests/support/file-server.ts'],
          testTimeout: 90_000,
          hookTimeout: 90_000,
          // One browser at a time on a 2-core machine.
          fileParallelism: false,
        },
      },
    ],
  },
})
