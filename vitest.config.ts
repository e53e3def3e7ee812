import { defineConfig } from 'vitest/config'

// Two layers run by `npm test`: plain-Node unit tests and API tests against the built server.
// Browser tests (tests/e2e) run separately with `npm run test:e2e`.
export default defineConfig({
  test: {
    projects: [
      {
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          environment: 'node',
        },
      },
      {
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          globalSetup: ['tests/api/global-setup.ts'],
          environment: 'node',
          testTimeout: 60_000,
          hookTimeout: 240_000,
          fileParallelism: false,
        },
      },
    ],
  },
})
