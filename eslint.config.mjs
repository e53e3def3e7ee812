import { createConfigForNuxt } from '@nuxt/eslint-config/flat'

export default createConfigForNuxt({
  // The framework's own stylistic rules (two-space indent, single quotes, no semicolons), plus a line width.
  features: { stylistic: true },
}).append(
  { ignores: ['server/db/migrations/**', 'tests/e2e/screenshots/**'] },
  {
    rules: {
      // 120 columns; a long string, URL or pattern may run past it rather than be cut mid-sentence.
      '@stylistic/max-len': ['error', {
        code: 120, ignoreUrls: true, ignoreStrings: true, ignoreTemplateLiterals: true, ignoreRegExpLiterals: true,
      }],
      // Short elements stay on one line; one with more attributes gets one attribute a line.
      'vue/max-attributes-per-line': ['error', { singleline: { max: 3 }, multiline: { max: 1 } }],
      // Breaking `<dt>Label</dt>` over three lines adds nothing and changes the text nodes tests read;
      // a long start tag is split by attribute, with its `>` hugging the content for the same reason.
      'vue/singleline-html-element-content-newline': 'off',
      'vue/multiline-html-element-content-newline': 'off',
      // A one-line callback such as `() => { open.value = false }` reads better than three lines.
      '@stylistic/max-statements-per-line': 'off',
    },
  },
  // Tests read loosely typed JSON answers; asserting on them is the point.
  { files: ['tests/**'], rules: { '@typescript-eslint/no-explicit-any': 'off' } },
  // Both wait for the browser to be idle, which a page with an animation may never be: a user action
  // that awaits them can hang for good. useRefreshData() refreshes without that wait.
  {
    files: ['**/*.vue', 'composables/**', 'utils/**', 'plugins/**', 'middleware/**', 'stores/**'],
    rules: {
      'no-restricted-syntax': ['error',
        {
          selector: 'CallExpression[callee.name=\'refreshNuxtData\']',
          message: 'Use useRefreshData(): refreshNuxtData waits for an idle callback that may never come.',
        },
        {
          selector: 'CallExpression[callee.name=\'onNuxtReady\']',
          message: 'Do not wait on onNuxtReady in the app: it waits for an idle callback that may never come.',
        },
      ],
    },
  },
)
