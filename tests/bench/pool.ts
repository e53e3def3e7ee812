import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { Worker } from 'node:worker_threads'
import { buildSync } from 'esbuild'
import {
  claimFromCounter,
  finishOutlook,
  mergePartials,
  runClaimedBlocks,
  type OutlookPartial,
  type OutlookPlan,
  type OutlookResult,
} from '../../shared/engine'

/**
 * A worker keeps its sampling scratch between requests; what it still allocates per request (the plan
 * it receives, the tables built for it, the partial it sends back) filled a 4 MB young generation about
 * three times per 100k run, each scavenge inside the timed path. 16 MB brings that to about one, and
 * the process's peak RSS at 1M stays near 255 MB (checked with --trace-gc and the bench's own figure).
 */
const WORKER_OPTIONS = { resourceLimits: { maxYoungGenerationSizeMb: 16 } }

/**
 * The worker script, bundled with the engine by esbuild as the server's is (`modules/outlook-worker.ts`).
 * Loading TypeScript through tsx in each thread instead cost about 50 MB of RSS per thread.
 */
function bundleWorker(): { file: string, remove: () => void } {
  const folder = mkdtempSync(join(tmpdir(), 'brinkwater-bench-'))
  const file = join(folder, 'worker.mjs')
  const entry = fileURLToPath(new URL('./worker.ts', import.meta.url))
  buildSync({
    entryPoints: [entry],
    outfile: file,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    logLevel: 'warning',
  })
  return { file, remove: () => rmSync(folder, { recursive: true, force: true }) }
}

export interface PoolRequest {
  runId: number
  /** Sent only when the worker has not seen this run yet. */
  plan?: OutlookPlan
  /** The run's shared counter: the next block to sample is claimed with Atomics.add. */
  nextBlock: Int32Array
}

export type PoolReply = { partial: OutlookPartial, error?: undefined } | { error: string, partial?: undefined }

/**
 * A small persistent pool. Every thread of a run (the workers, and the calling thread when `mainShare`
 * is on) claims blocks one at a time from one shared counter until none are left, so a thread that
 * starts late or runs slowly on a busy machine takes fewer blocks instead of holding up the run.
 * Results are bit-identical to a single-thread run. A plan is sent to a worker once per run id; a new
 * request is a new run.
 */
export class OutlookPool {
  private readonly workers: Worker[]
  private readonly seenRun: number[]
  private nextRunId = 1

  private readonly script = bundleWorker()

  constructor(size: number, private readonly mainShare: boolean) {
    this.workers = Array.from({ length: size }, () => new Worker(this.script.file, WORKER_OPTIONS))
    this.seenRun = this.workers.map(() => 0)
  }

  private request(w: number, request: PoolRequest): Promise<OutlookPartial> {
    const worker = this.workers[w]!
    return new Promise((resolve, reject) => {
      const fail = (error: Error) => reject(error)
      worker.once('error', fail)
      worker.once('message', (reply: PoolReply) => {
        worker.off('error', fail)
        if (reply.error !== undefined) reject(new Error(reply.error))
        else resolve(reply.partial)
      })
      worker.postMessage(request)
    })
  }

  /** A run id for a plan: reuse it to sample the same plan again without sending it. */
  newRun(): number {
    return this.nextRunId++
  }

  async run(plan: OutlookPlan, runId: number = this.newRun()): Promise<OutlookResult> {
    const nextBlock = new Int32Array(new SharedArrayBuffer(4))
    const pending = this.workers.map((_, w) => {
      const plainRequest: PoolRequest = { runId, nextBlock }
      const request = this.seenRun[w] === runId ? plainRequest : { ...plainRequest, plan }
      this.seenRun[w] = runId
      return this.request(w, request)
    })
    const partials: OutlookPartial[] = []
    if (this.mainShare) partials.push(runClaimedBlocks(plan, claimFromCounter(nextBlock, plan.blockCount)))
    partials.push(...(await Promise.all(pending)))
    return finishOutlook(plan, mergePartials(plan, partials))
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map(worker => worker.terminate()))
    this.script.remove()
  }
}
