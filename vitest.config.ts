import { defineVitestProject } from '@nuxt/test-utils/config'
import { defineConfig } from 'vitest/config'

/**
 * Four projects: `unit` (the engine and pure logic, plain Node), `nuxt` (stores and composables
 * inside the Nuxt runtime, in happy-dom, with the server's answers stubbed), `api` (routes against the
 * built server), `e2e` (real Chromium against it). The app is built and a template database
 * seeded once (tests/support/global-setup.ts); each api and e2e file starts its own server on
 * its own copy of that database (tests/support/file-server.ts).
 */
export default defineConfig({
  test: {
    projects: [
      {
        // Ceilings for a machine with every core busy (a slow run is slower, not red); no test waits on time.
        test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node', testTimeout: 30_000 },
      },
      await defineVitestProject({
        test: {
          name: 'nuxt',
          include: ['tests/nuxt/**/*.test.ts'],
          environment: 'nuxt',
          setupFiles: ['tests/nuxt/setup.ts'],
          // The Nuxt runtime's start took over vitest's 10 s hook ceiling with every core busy.
          testTimeout: 30_000,
          hookTimeout: 60_000,
          environmentOptions: {
            nuxt: {
              domEnvironment: 'happy-dom',
              // Its own build folder: the api and e2e set-up builds the app (.nuxt) while these tests run.
              overrides: { buildDir: 'node_modules/.cache/nuxt-vitest' },
            },
          },
        },
      }),
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/support/global-setup.ts'],
          setupFiles: ['tests/support/file-server.ts'],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          expect: { poll: { timeout: 15_000 } },
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
          // A condition a browser test waits on (expect.poll) gets 20 s, not vitest's 1 s: with every core busy a
          // countersign (a password hash, a PDF) took longer than 1 s. A condition met early returns at once.
          expect: { poll: { timeout: 20_000 } },
          // One browser at a time on a 2-core machine.
          fileParallelism: false,
        },
      },
    ],
  },
})
