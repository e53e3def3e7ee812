import { createConfigForNuxt } from '@nuxt/eslint-config/flat'

export default createConfigForNuxt({
  features: { stylistic: false },
}).append({
  ignores: ['server/db/migrations/**', 'tests/e2e/screenshots/**'],
})
