import { createConfigForNuxt } from '@nuxt/eslint-config/flat'

export default createConfigForNuxt({
  features: { stylistic: false },
}).append(
  { ignores: ['server/db/migrations/**', 'tests/e2e/screenshots/**'] },
  // Tests read loosely typed JSON answers; asserting on them is the point.
  { files: ['tests/**'], rules: { '@typescript-eslint/no-explicit-any': 'off' } },
  // Both wait for the browser to be idle, which a page with an animation may never be: a user action
  // that awaits them can hang for good. useRefreshData() refreshes without that wait.
  {
    files: ['**/*.vue', 'composables/**', 'utils/**', 'plugins/**', 'middleware/**', 'stores/**'],
    rules: {
      'no-restricted-syntax': ['error',
        { selector: "CallExpression[callee.name='refreshNuxtData']", message: 'Use useRefreshData(): refreshNuxtData waits for an idle callback that may never come.' },
        { selector: "CallExpression[callee.name='onNuxtReady']", message: 'Do not wait on onNuxtReady in the app: it waits for an idle callback that may never come.' },
      ],
    },
  },
)
