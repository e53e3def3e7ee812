import { dirname, join } from 'node:path'
import { Worker } from 'node:worker_threads'
import {
  finishOutlook,
  mergePartials,
  planOutlook,
  type OutlookPartial,
  type OutlookPlan,
} from '#shared/engine'

// Outlooks run off the request thread on a small pool of worker threads. Every free thread joins the
// oldest job and claims its blocks one at a time from a counter the threads share, so a thread that
// starts late or runs slowly takes fewer blocks; each thread answers once with one partial. Partials
// merge in block order, so the numbers are the same bit for bit whatever the split (see
// shared/engine/README.md).

/** How often a running job's progress (blocks claimed) is reported: the outlook page and its lease. */
const PROGRESS_EVERY_MS = 250

interface Job {
  id: number
  plan: OutlookPlan
  /** Next block to claim, shared with the threads (Atomics). */
  nextBlock: Int32Array
  partials: OutlookPartial[]
  /** Threads working on the job that have not answered yet. */
  working: Set<Worker>
  sentTo: Set<Worker>
  onProgress: (fraction: number) => void
  /** What the caller wants from the merged partial (an outlook, or a measure's chances by year). */
  finish: (plan: OutlookPlan, merged: OutlookPartial) => unknown
  resolve: (result: unknown) => void
  reject: (error: Error) => void
}

interface Reply { jobId: number, partial?: OutlookPartial, error?: string }

function workerScript() {
  const configured = useRuntimeConfig().outlookWorkerPath as string | undefined
  // The built server is started as `node .output/server/index.mjs`; the worker sits beside it.
  return configured || join(dirname(process.argv[1]!), 'workers/outlook-worker.mjs')
}

const claimed = (job: Job) => Math.min(Atomics.load(job.nextBlock, 0), job.plan.blockCount)

class OutlookPool {
  private readonly idle: Worker[] = []
  private readonly jobs: Job[] = []
  private nextJobId = 1
  private progressTimer: ReturnType<typeof setInterval> | null = null

  constructor(size: number) {
    for (let i = 0; i < size; i++) this.idle.push(this.spawn())
  }

  private spawn(): Worker {
    const worker = new Worker(workerScript())
    worker.unref()
    worker.on('message', (reply: Reply) => this.receive(worker, reply))
    worker.on('error', (error: Error) => {
      // A crashed thread fails the jobs it was serving (its claimed blocks are lost) and is replaced.
      for (const job of this.jobs.filter(j => j.working.has(worker))) this.fail(job, error)
      this.idle.push(this.spawn())
      this.dispatch()
    })
    return worker
  }

  run<T>(
    plan: OutlookPlan,
    finish: (plan: OutlookPlan, merged: OutlookPartial) => T,
    onProgress: (fraction: number) => void,
  ): Promise<T> {
    return new Promise<T>((resolve, reject) => {
      const nextBlock = new Int32Array(new SharedArrayBuffer(Int32Array.BYTES_PER_ELEMENT))
      this.jobs.push({
        id: this.nextJobId++,
        plan,
        nextBlock,
        partials: [],
        working: new Set(),
        sentTo: new Set(),
        onProgress,
        finish,
        resolve: resolve as (result: unknown) => void,
        reject,
      })
      this.dispatch()
      this.progressTimer ??= setInterval(() => this.reportProgress(), PROGRESS_EVERY_MS).unref()
    })
  }

  private dispatch() {
    while (this.idle.length) {
      const job = this.jobs.find(j => claimed(j) < j.plan.blockCount)
      if (!job) return
      const worker = this.idle.pop()!
      const plan = job.sentTo.has(worker) ? undefined : job.plan
      job.sentTo.add(worker)
      job.working.add(worker)
      worker.postMessage({ jobId: job.id, plan, nextBlock: job.nextBlock })
    }
  }

  private receive(worker: Worker, reply: Reply) {
    this.idle.push(worker)
    const job = this.jobs.find(j => j.id === reply.jobId)
    if (job) {
      job.working.delete(worker)
      if (reply.error) this.fail(job, new Error(reply.error))
      else if (reply.partial) {
        job.partials.push(reply.partial)
        // A thread answers when no block is left to claim; the job is done when all of its threads have.
        if (!job.working.size) this.finish(job)
      }
    }
    this.dispatch()
  }

  private reportProgress() {
    for (const job of this.jobs) job.onProgress(claimed(job) / job.plan.blockCount)
    if (!this.jobs.length && this.progressTimer) {
      clearInterval(this.progressTimer)
      this.progressTimer = null
    }
  }

  private finish(job: Job) {
    this.jobs.splice(this.jobs.indexOf(job), 1)
    try {
      job.onProgress(1)
      job.resolve(job.finish(job.plan, mergePartials(job.plan, job.partials)))
    }
    catch (error) {
      job.reject(error as Error)
    }
  }

  private fail(job: Job, error: Error) {
    const index = this.jobs.indexOf(job)
    if (index >= 0) this.jobs.splice(index, 1)
    // Threads still on the job stop at the next claim.
    Atomics.store(job.nextBlock, 0, job.plan.blockCount)
    job.reject(error)
  }
}

let pool: OutlookPool | undefined

/** Samples a plan's blocks on the pool and hands the merged partial to `finish`, on this thread. */
export function runPlanOffThread<T>(
  plan: OutlookPlan,
  finish: (plan: OutlookPlan, merged: OutlookPartial) => T,
  onProgress: (fraction: number) => void = () => {},
): Promise<T> {
  pool ??= new OutlookPool(serverConfig().OUTLOOK_WORKERS)
  return pool.run(plan, finish, onProgress)
}

/** Plans on this thread (validation errors surface here), samples on the pool. */
export function runOutlookOffThread(input: unknown, onProgress?: (fraction: number) => void) {
  return runPlanOffThread(planOutlook(input), finishOutlook, onProgress)
}
