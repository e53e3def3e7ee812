import { mkdir } from 'node:fs/promises'
import { join } from 'node:path'
import { build } from 'esbuild'
import { defineNuxtModule } from 'nuxt/kit'

// Outlooks and a release's checks run on worker threads, which need script files of their own. This
// bundles server/workers/outlook-worker.ts and release-worker.ts (and the engine they import) with
// esbuild: into .nuxt for `nuxt dev`, and beside the built server (.output/server/workers) for production.
export default defineNuxtModule({
  meta: { name: 'outlook-worker' },
  setup(_options, nuxt) {
    const entry = (name: string) => join(nuxt.options.rootDir, `server/workers/${name}.ts`)
    const bundleOne = (name: string, dir: string) => build({ entryPoints: [entry(name)], outfile: join(dir, `${name}.mjs`), bundle: true, platform: 'node', format: 'esm', target: 'node20', logLevel: 'warning' })
    const bundle = (dir: string) => Promise.all([bundleOne('outlook-worker', dir), bundleOne('release-worker', dir)])

    if (nuxt.options.dev) {
      const dir = join(nuxt.options.buildDir, 'workers')
      nuxt.options.runtimeConfig.outlookWorkerPath = join(dir, 'outlook-worker.mjs')
      nuxt.options.runtimeConfig.releaseWorkerPath = join(dir, 'release-worker.mjs')
      nuxt.hook('nitro:build:before', async () => {
        await mkdir(dir, { recursive: true })
        await bundle(dir)
      })
      return
    }
    nuxt.options.runtimeConfig.outlookWorkerPath = ''
    nuxt.options.runtimeConfig.releaseWorkerPath = ''
    nuxt.hook('nitro:init', (nitro) => {
      nitro.hooks.hook('compiled', async () => {
        await bundle(join(nitro.options.output.serverDir, 'workers'))
      })
    })
  },
})
