import { Worker } from 'node:worker_threads'
import { finishOutlook, mergePartials, runBlocks, type OutlookPartial, type OutlookPlan, type OutlookResult } from '../../shared/engine'

/**
 * A small persistent pool: blocks are split into contiguous ranges, one per worker plus one for the
 * calling thread when `mainShare` is on. Results are bit-identical to a single-thread run.
 */
export class OutlookPool {
  private readonly workers: Worker[]

  constructor(size: number, private readonly mainShare: boolean) {
    this.workers = Array.from({ length: size }, () => new Worker(new URL('./worker-entry.mjs', import.meta.url)))
  }

  private request<T>(worker: Worker, message: unknown): Promise<T> {
    return new Promise((resolve, reject) => {
      const fail = (error: Error) => reject(error)
      worker.once('error', fail)
      worker.once('message', (reply: T) => {
        worker.off('error', fail)
        resolve(reply)
      })
      worker.postMessage(message)
    })
  }

  async load(plan: OutlookPlan): Promise<void> {
    await Promise.all(this.workers.map((worker) => this.request(worker, { plan })))
  }

  async run(plan: OutlookPlan): Promise<OutlookResult> {
    const shares = this.workers.length + (this.mainShare ? 1 : 0)
    const ranges: Array<[number, number]> = []
    let first = 0
    for (let s = 0; s < shares; s++) {
      const count = Math.floor((plan.blockCount - first) / (shares - s))
      ranges.push([first, count])
      first += count
    }
    const pending = this.workers.map((worker, w) =>
      this.request<{ partial: OutlookPartial }>(worker, { firstBlock: ranges[w]![0], blockCount: ranges[w]![1] }),
    )
    const partials: OutlookPartial[] = []
    if (this.mainShare) {
      const [firstBlock, blockCount] = ranges[ranges.length - 1]!
      partials.push(runBlocks(plan, firstBlock, blockCount))
    }
    for (const reply of await Promise.all(pending)) partials.push(reply.partial)
    return finishOutlook(plan, mergePartials(plan, partials))
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((worker) => worker.terminate()))
  }
}
