import { parentPort } from 'node:worker_threads'
import { runBlocks, type OutlookPlan } from '../../shared/engine'

// A pool thread: samples the block ranges it is asked for. The plan of a job is sent once per
// thread and kept until the next job; partial statistics go back with their buffers transferred.

export interface ChunkRequest { jobId: number, plan?: OutlookPlan, firstBlock: number, blockCount: number }

let current: { jobId: number, plan: OutlookPlan } | null = null

parentPort!.on('message', (request: ChunkRequest) => {
  try {
    if (request.plan) current = { jobId: request.jobId, plan: request.plan }
    if (!current || current.jobId !== request.jobId) throw new Error(`No plan for job ${request.jobId}`)
    const partial = runBlocks(current.plan, request.firstBlock, request.blockCount)
    const buffers = Object.values(partial).filter(ArrayBuffer.isView).map(view => (view as Float64Array).buffer as ArrayBuffer)
    parentPort!.postMessage({ jobId: request.jobId, firstBlock: request.firstBlock, partial }, buffers)
  }
  catch (error) {
    parentPort!.postMessage({ jobId: request.jobId, firstBlock: request.firstBlock, error: error instanceof Error ? error.message : String(error) })
  }
})
