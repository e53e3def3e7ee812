import { Worker } from 'node:worker_threads'
import { finishOutlook, mergePartials, runBlocks, type OutlookPartial, type OutlookPlan, type OutlookResult } from '../../shared/engine'

/**
 * A worker keeps its sampling scratch between requests; what it still allocates per request (the plan
 * it receives, the tables built for it, the partial it sends back) filled a 4 MB young generation about
 * three times per 100k run, each scavenge inside the timed path. 16 MB brings that to about one, and
 * the process's peak RSS at 1M stays near 255 MB (checked with --trace-gc and the bench's own figure).
 */
const WORKER_OPTIONS = { resourceLimits: { maxYoungGenerationSizeMb: 16 } }

export interface PoolRequest {
  runId: number
  /** Sent only when the worker has not seen this run yet. */
  plan?: OutlookPlan
  firstBlock: number
  blockCount: number
}

export type PoolReply = { partial: OutlookPartial; error?: undefined } | { error: string; partial?: undefined }

/**
 * Contiguous block ranges with samples as even as possible (the last block may be short): the run takes
 * as long as its largest share.
 */
export function splitBlocks(plan: OutlookPlan, shares: number): Array<[number, number]> {
  const ranges: Array<[number, number]> = []
  let first = 0
  for (let s = 0; s < shares; s++) {
    const remainingSamples = plan.samples - first * plan.blockSize
    const target = remainingSamples / (shares - s)
    let count = 0
    while (first + count < plan.blockCount && (count + 0.5) * plan.blockSize <= target) count++
    if (s === shares - 1) count = plan.blockCount - first
    ranges.push([first, count])
    first += count
  }
  return ranges
}

/**
 * A small persistent pool: blocks are split into contiguous ranges, one per worker plus one for the
 * calling thread when `mainShare` is on. Results are bit-identical to a single-thread run. A plan is sent
 * to a worker once per run id; a new request is a new run.
 */
export class OutlookPool {
  private readonly workers: Worker[]
  private readonly seenRun: number[]
  private nextRunId = 1

  constructor(size: number, private readonly mainShare: boolean) {
    this.workers = Array.from({ length: size }, () => new Worker(new URL('./worker-entry.mjs', import.meta.url), WORKER_OPTIONS))
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
    const shares = this.workers.length + (this.mainShare ? 1 : 0)
    const ranges = splitBlocks(plan, shares)
    const pending = this.workers.map((_, w) => {
      const [firstBlock, blockCount] = ranges[w]!
      const plainRequest: PoolRequest = { runId, firstBlock, blockCount }
      const request = this.seenRun[w] === runId ? plainRequest : { ...plainRequest, plan }
      this.seenRun[w] = runId
      return this.request(w, request)
    })
    const partials: OutlookPartial[] = []
    if (this.mainShare) {
      const [firstBlock, blockCount] = ranges[ranges.length - 1]!
      partials.push(runBlocks(plan, firstBlock, blockCount))
    }
    partials.push(...(await Promise.all(pending)))
    return finishOutlook(plan, mergePartials(plan, partials))
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((worker) => worker.terminate()))
  }
}
