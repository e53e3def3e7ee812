import { parentPort } from 'node:worker_threads'
import { claimFromCounter, runClaimedBlocks, type OutlookPlan } from '../../shared/engine'

// A pool thread: samples the blocks of a job it claims from the job's shared counter, until none are
// left, and answers with one partial. The plan of a job is sent once per thread and kept until the
// next job; partial statistics go back with their buffers transferred.

export interface JobRequest {
  jobId: number
  plan?: OutlookPlan
  /** The job's counter: the next block to sample, taken with Atomics.add by every thread on the job. */
  nextBlock: Int32Array
}

let current: { jobId: number, plan: OutlookPlan } | null = null

parentPort!.on('message', (request: JobRequest) => {
  try {
    if (request.plan) current = { jobId: request.jobId, plan: request.plan }
    if (!current || current.jobId !== request.jobId) throw new Error(`No plan for job ${request.jobId}`)
    const partial = runClaimedBlocks(current.plan, claimFromCounter(request.nextBlock, current.plan.blockCount))
    const buffers = Object.values(partial)
      .filter(ArrayBuffer.isView)
      .map(view => (view as Float64Array).buffer as ArrayBuffer)
    parentPort!.postMessage({ jobId: request.jobId, partial }, buffers)
  }
  catch (error) {
    parentPort!.postMessage({ jobId: request.jobId, error: error instanceof Error ? error.message : String(error) })
  }
})
