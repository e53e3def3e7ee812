import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'

// server/plugins/shared-runtime-config.ts hands every request one frozen runtime config by leaving it
// where Nitro's useRuntimeConfig(event) looks first, event.context.nitro.runtimeConfig: a framework
// internal (Nitro has no public way to skip its per-request copy). This fails, naming the internal and
// the installed version, when an upgrade changes it; the plugin would then do nothing or break.

const root = new URL('../../../node_modules/nitropack/', import.meta.url)
const NITRO = JSON.parse(readFileSync(new URL('package.json', root), 'utf8')).version as string
const source = readFileSync(new URL('dist/runtime/internal/config.mjs', root), 'utf8').replace(/\s+/g, ' ')

describe('the framework internal behind the shared runtime config', () => {
  it('useRuntimeConfig(event) still returns event.context.nitro.runtimeConfig when set, before copying', () => {
    const usesIt = source.includes(
      'if (event.context.nitro.runtimeConfig) { return event.context.nitro.runtimeConfig; }',
    )
    const copyAfter
      = source.indexOf('return event.context.nitro.runtimeConfig;')
        < source.indexOf('const runtimeConfig = klona(_inlineRuntimeConfig);')
    expect(
      usesIt && copyAfter,
      `nitropack ${NITRO}: useRuntimeConfig(event) no longer reads event.context.nitro.runtimeConfig first, which server/plugins/shared-runtime-config.ts relies on. Re-check that file against this version (measure with \`npm run load\`), then update this test.`,
    ).toBe(true)
  })
})
