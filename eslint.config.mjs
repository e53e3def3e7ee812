import { createConfigForNuxt } from '@nuxt/eslint-config/flat'

export default createConfigForNuxt({
  features: { stylistic: false },
}).append(
  { ignores: ['server/db/migrations/**', 'tests/e2e/screenshots/**'] },
  // Tests read loosely typed JSON answers; asserting on them is the point.
  { files: ['tests/**'], rules: { '@typescript-eslint/no-explicit-any': 'off' } },
)
