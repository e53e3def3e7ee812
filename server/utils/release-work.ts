import { Worker } from 'node:worker_threads'
import { dirname, join } from 'node:path'
import type { BandsAtYear } from '#shared/releases/summary'
import type { ParsedRelease } from '#shared/engine'
import type { ReleaseWork } from '../workers/release-worker'

// A release's engine work runs off the request thread, on a worker of its own, within a time budget:
// one analyst's large release must not freeze every other request. At most MAX_RUNNING run at once and
// the rest wait their turn; past the budget, or with too many waiting, the answer is 503 saying what to do.

const busy = (message: string) => createError({ statusCode: 503, message })

const MAX_RUNNING = 4
const MAX_WAITING = 32
let running = 0
const waiting: Array<() => void> = []

async function takeSlot() {
  if (running < MAX_RUNNING) {
    running++
    return
  }
  if (waiting.length >= MAX_WAITING) throw busy('Many releases are being checked just now. Try again in a minute.')
  // The slot passes straight from the work that ends to the one that waited longest.
  await new Promise<void>(resolve => waiting.push(resolve))
}

function giveSlot() {
  const next = waiting.shift()
  if (next) next()
  else running--
}

interface Reply {
  release?: ParsedRelease
  anchorYears?: number[]
  bands?: BandsAtYear[]
  issues?: { field: string, message: string }[]
  error?: string
}

function workerScript() {
  const configured = useRuntimeConfig().releaseWorkerPath as string | undefined
  // The built server is started as `node .output/server/index.mjs`; the worker sits beside it.
  return configured || join(dirname(process.argv[1]!), 'workers/release-worker.mjs')
}

/** Builds and checks a release as entered and gives its bands; 400 naming the field, or 503. */
export async function releaseWork(
  work: Extract<ReleaseWork, { input: unknown }>,
): Promise<{ release: ParsedRelease, bands: BandsAtYear[] }> {
  const reply = await runReleaseWorker(work)
  if (!reply.release || !reply.bands) throw new Error(reply.error ?? 'The release worker gave no answer.')
  return { release: reply.release, bands: reply.bands }
}

/**
 * The editor's preview of a body exactly as sent: parsed, checked against the shared schema and
 * turned into bands on the worker, so even the largest release leaves this thread free.
 */
export async function previewReleaseBody(
  raw: string | undefined,
): Promise<{ anchorYears: number[], bands: BandsAtYear[] }> {
  const reply = await runReleaseWorker({ raw, years: 'preview' })
  if (!reply.anchorYears || !reply.bands) throw new Error(reply.error ?? 'The release worker gave no answer.')
  return { anchorYears: reply.anchorYears, bands: reply.bands }
}

async function runReleaseWorker(work: ReleaseWork): Promise<Reply> {
  await takeSlot()
  const worker = new Worker(workerScript(), { workerData: work })
  try {
    const reply = await new Promise<Reply>((resolve, reject) => {
      const budgetMs = serverConfig().RELEASE_WORK_MS
      const timer = setTimeout(
        () =>
          reject(
            busy(
              `Checking this release took longer than ${budgetMs / 1000} s, so it was stopped. Send fewer draws or anchor years, or try again when the server is less busy.`,
            ),
          ),
        budgetMs,
      )
      worker.once('message', (message: Reply) => { clearTimeout(timer); resolve(message) })
      worker.once('error', (error) => { clearTimeout(timer); reject(error) })
    })
    if (reply.issues)
      throw createError({
        statusCode: 400,
        message: reply.issues.map(issue => `${issue.field}: ${issue.message}`).join(' '),
        data: { issues: reply.issues },
      })
    return reply
  }
  finally {
    giveSlot()
    void worker.terminate()
  }
}
