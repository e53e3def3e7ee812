import { mkdir } from 'node:fs/promises'
import { join } from 'node:path'
import { build } from 'esbuild'
import { defineNuxtModule } from 'nuxt/kit'

// Outlooks run on worker threads, which need a script file of their own. This bundles
// server/workers/outlook-worker.ts (and the engine it imports) with esbuild: into .nuxt for
// `nuxt dev`, and beside the built server (.output/server/workers) for production.
export default defineNuxtModule({
  meta: { name: 'outlook-worker' },
  setup(_options, nuxt) {
    const entry = join(nuxt.options.rootDir, 'server/workers/outlook-worker.ts')
    const bundle = (outfile: string) => build({ entryPoints: [entry], outfile, bundle: true, platform: 'node', format: 'esm', target: 'node20', logLevel: 'warning' })

    if (nuxt.options.dev) {
      const outfile = join(nuxt.options.buildDir, 'workers/outlook-worker.mjs')
      nuxt.options.runtimeConfig.outlookWorkerPath = outfile
      nuxt.hook('nitro:build:before', async () => {
        await mkdir(join(nuxt.options.buildDir, 'workers'), { recursive: true })
        await bundle(outfile)
      })
      return
    }
    nuxt.options.runtimeConfig.outlookWorkerPath = ''
    nuxt.hook('nitro:init', (nitro) => {
      nitro.hooks.hook('compiled', async () => {
        await bundle(join(nitro.options.output.serverDir, 'workers/outlook-worker.mjs'))
      })
    })
  },
})
