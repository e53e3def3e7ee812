import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'
import { defineVitestProject } from '@nuxt/test-utils/config'

// Client code imports shared code through Nuxt's #shared alias; unit tests that load it need the same.
const shared = { '#shared': fileURLToPath(new URL('./shared', import.meta.url)) }

// Two layers run by `npm test`: plain-Node unit tests and API tests against the built server.
// `npm run test:postgres` runs what needs a PostgreSQL server. Browser tests (the e2e project) run separately with `npm
// run test:e2e`, which checks for Chromium first.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
        },
        resolve: { alias: shared },
      },
      // Components and composables mounted in a Nuxt app on happy-dom (auto-imports, i18n, the real
      // components), without a server: `npx vitest run --project components`.
      await defineVitestProject({
        test: {
          name: 'components',
          include: ['tests/components/**/*.test.ts'],
          environment: 'nuxt',
          // Each file starts a Nuxt app first, which takes seconds on a loaded two-core machine.
          hookTimeout: 60_000,
          testTimeout: 30_000,
        },
      }),
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/support/build.ts'],
          environment: 'node',
          testTimeout: 60_000,
          hookTimeout: 240_000,
          fileParallelism: false,
        },
      },
      {
        // Needs a PostgreSQL server: BRINKWATER_TEST_DATABASE_URL (`.ci/run` starts one). Several app
        // instances on one database, which embedded PGlite cannot do.
        test: {
          name: 'postgres',
          include: ['tests/postgres/**/*.test.ts'],
          globalSetup: ['tests/support/build.ts'],
          environment: 'node',
          testTimeout: 120_000,
          hookTimeout: 240_000,
          fileParallelism: false,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['tests/support/build.ts'],
          testTimeout: 60_000,
          hookTimeout: 240_000,
          fileParallelism: false,
        },
      },
    ],
  },
})
