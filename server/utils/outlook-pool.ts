import { availableParallelism } from 'node:os'
import { dirname, join } from 'node:path'
import { Worker } from 'node:worker_threads'
import { finishOutlook, mergePartials, planOutlook, type OutlookPartial, type OutlookPlan, type OutlookResult } from '#shared/engine'

// Outlooks run off the request thread on a small pool of worker threads. A job's blocks are cut
// into chunks handed to whichever thread is free; partials merge in block order, so the numbers
// are the same bit for bit whatever the split (see shared/engine/README.md).

/**
 * Chunks shrink as a job nears its end (a share of what is left per free thread), so threads finish
 * together; a chunk of at least a few blocks keeps the messages few, and a cap keeps progress moving.
 */
const MIN_CHUNK_BLOCKS = 2
const MAX_CHUNK_BLOCKS = 32

/** Blocks for the next chunk of a job with `remaining` blocks left, on a pool of `threads`. */
function chunkBlocks(remaining: number, threads: number): number {
  const share = Math.ceil(remaining / (2 * threads))
  return Math.min(remaining, Math.max(MIN_CHUNK_BLOCKS, Math.min(MAX_CHUNK_BLOCKS, share)))
}

interface Job {
  id: number
  plan: OutlookPlan
  nextBlock: number
  partials: OutlookPartial[]
  blocksDone: number
  sentTo: Set<Worker>
  onProgress: (fraction: number) => void
  resolve: (result: OutlookResult) => void
  reject: (error: Error) => void
}

interface Reply { jobId: number, firstBlock: number, partial?: OutlookPartial, error?: string }

function workerScript() {
  const configured = useRuntimeConfig().outlookWorkerPath as string | undefined
  // The built server is started as `node .output/server/index.mjs`; the worker sits beside it.
  return configured || join(dirname(process.argv[1]!), 'workers/outlook-worker.mjs')
}

class OutlookPool {
  private readonly idle: Worker[] = []
  private readonly jobs: Job[] = []
  private nextJobId = 1

  constructor(private readonly size: number) {
    for (let i = 0; i < size; i++) this.idle.push(this.spawn())
  }

  private spawn(): Worker {
    const worker = new Worker(workerScript())
    worker.unref()
    worker.on('message', (reply: Reply) => this.receive(worker, reply))
    worker.on('error', (error: Error) => {
      // A crashed thread fails the jobs it was serving and is replaced.
      for (const job of this.jobs.filter(j => j.sentTo.has(worker))) this.fail(job, error)
      this.idle.push(this.spawn())
    })
    return worker
  }

  run(plan: OutlookPlan, onProgress: (fraction: number) => void = () => {}): Promise<OutlookResult> {
    return new Promise((resolve, reject) => {
      this.jobs.push({ id: this.nextJobId++, plan, nextBlock: 0, partials: [], blocksDone: 0, sentTo: new Set(), onProgress, resolve, reject })
      this.dispatch()
    })
  }

  private dispatch() {
    while (this.idle.length) {
      const job = this.jobs.find(j => j.nextBlock < j.plan.blockCount)
      if (!job) return
      const worker = this.idle.pop()!
      const blockCount = chunkBlocks(job.plan.blockCount - job.nextBlock, this.size)
      const plan = job.sentTo.has(worker) ? undefined : job.plan
      job.sentTo.add(worker)
      worker.postMessage({ jobId: job.id, plan, firstBlock: job.nextBlock, blockCount })
      job.nextBlock += blockCount
    }
  }

  private receive(worker: Worker, reply: Reply) {
    this.idle.push(worker)
    const job = this.jobs.find(j => j.id === reply.jobId)
    if (job && reply.error) this.fail(job, new Error(reply.error))
    else if (job && reply.partial) {
      job.partials.push(reply.partial)
      job.blocksDone += reply.partial.blockCount
      job.onProgress(job.blocksDone / job.plan.blockCount)
      if (job.blocksDone === job.plan.blockCount) this.finish(job)
    }
    this.dispatch()
  }

  private finish(job: Job) {
    this.jobs.splice(this.jobs.indexOf(job), 1)
    try {
      job.resolve(finishOutlook(job.plan, mergePartials(job.plan, job.partials)))
    }
    catch (error) {
      job.reject(error as Error)
    }
  }

  private fail(job: Job, error: Error) {
    const index = this.jobs.indexOf(job)
    if (index >= 0) this.jobs.splice(index, 1)
    job.reject(error)
  }
}

let pool: OutlookPool | undefined

/** Plans on this thread (validation errors surface here), samples on the pool. */
export function runOutlookOffThread(input: unknown, onProgress?: (fraction: number) => void): Promise<OutlookResult> {
  const plan = planOutlook(input)
  pool ??= new OutlookPool(Number(process.env.OUTLOOK_WORKERS) || Math.max(1, Math.min(4, availableParallelism())))
  return pool.run(plan, onProgress)
}
