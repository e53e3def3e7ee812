import { dirname, join } from 'node:path'

// Where a worker thread's script is (each is bundled by modules/outlook-worker.ts): in development the
// runtime config names it under .nuxt/workers; the built server is started as
// `node .output/server/index.mjs`, and the scripts sit beside it in workers/.

const CONFIGURED_PATH = {
  'release-worker': 'releaseWorkerPath',
  'signposts-worker': 'signpostsWorkerPath',
  'land-motion-draws-worker': 'landMotionDrawsWorkerPath',
} as const

export type WorkerScriptName = keyof typeof CONFIGURED_PATH

export function workerScript(name: WorkerScriptName): string {
  const configured = useRuntimeConfig()[CONFIGURED_PATH[name]] as string | undefined
  return configured || join(dirname(process.argv[1]!), `workers/${name}.mjs`)
}
