import { mkdir } from 'node:fs/promises'
import { join } from 'node:path'
import { build } from 'esbuild'
import { defineNuxtModule } from 'nuxt/kit'

// Outlooks, a release's checks, a site's land-motion draws upload and signposts run on worker threads,
// which need script files of their own. This bundles the outlook thread (server/outlooks/worker.ts,
// beside the rest of the outlook feature) and the scripts in server/workers/, with the engine they
// import, using esbuild: into .nuxt for `nuxt dev`, and beside the built server (.output/server/workers,
// found by server/utils/worker-script.ts) for production. It stays in modules/ because Nuxt loads
// build-time modules from there; the code it bundles lives with its feature.
export default defineNuxtModule({
  meta: { name: 'outlook-worker' },
  setup(_options, nuxt) {
    const entries = {
      'outlook-worker': 'server/outlooks/worker.ts',
      'release-worker': 'server/workers/release-worker.ts',
      'signposts-worker': 'server/workers/signposts-worker.ts',
      'land-motion-draws-worker': 'server/workers/land-motion-draws-worker.ts',
    }
    const entry = (name: keyof typeof entries) => join(nuxt.options.rootDir, entries[name])
    const bundleOne = (name: keyof typeof entries, dir: string) =>
      build({
        entryPoints: [entry(name)],
        outfile: join(dir, `${name}.mjs`),
        bundle: true,
        platform: 'node',
        format: 'esm',
        target: 'node20',
        logLevel: 'warning',
      })
    const bundle = (dir: string) =>
      Promise.all((Object.keys(entries) as Array<keyof typeof entries>).map(name => bundleOne(name, dir)))

    if (nuxt.options.dev) {
      const dir = join(nuxt.options.buildDir, 'workers')
      nuxt.options.runtimeConfig.outlookWorkerPath = join(dir, 'outlook-worker.mjs')
      nuxt.options.runtimeConfig.releaseWorkerPath = join(dir, 'release-worker.mjs')
      nuxt.options.runtimeConfig.signpostsWorkerPath = join(dir, 'signposts-worker.mjs')
      nuxt.options.runtimeConfig.landMotionDrawsWorkerPath = join(dir, 'land-motion-draws-worker.mjs')
      nuxt.hook('nitro:build:before', async () => {
        await mkdir(dir, { recursive: true })
        await bundle(dir)
      })
      return
    }
    nuxt.options.runtimeConfig.outlookWorkerPath = ''
    nuxt.options.runtimeConfig.releaseWorkerPath = ''
    nuxt.options.runtimeConfig.signpostsWorkerPath = ''
    nuxt.options.runtimeConfig.landMotionDrawsWorkerPath = ''
    nuxt.hook('nitro:init', (nitro) => {
      nitro.hooks.hook('compiled', async () => {
        await bundle(join(nitro.options.output.serverDir, 'workers'))
      })
    })
  },
})
