import { parentPort } from 'node:worker_threads'
import { claimFromCounter, runClaimedBlocks, type OutlookPlan } from '../../shared/engine'
import type { PoolReply, PoolRequest } from './pool'

// A pool thread: keeps the plan of the run it last saw and samples the blocks it claims from the run's
// shared counter. The plan travels only with the first request of a run; later requests send the id.

let current: { runId: number, plan: OutlookPlan } | null = null

parentPort!.on('message', (request: PoolRequest) => {
  if (request.plan) current = { runId: request.runId, plan: request.plan }
  if (!current || current.runId !== request.runId) {
    parentPort!.postMessage({ error: `no plan for run ${request.runId}` } satisfies PoolReply)
    return
  }
  const partial = runClaimedBlocks(current.plan, claimFromCounter(request.nextBlock, current.plan.blockCount))
  // Partials are plain typed arrays; their buffers move to the caller instead of being copied.
  const transfer = [
    partial.blocks,
    partial.cellCounts,
    partial.histogram,
    partial.minimum,
    partial.maximum,
    partial.blockSums,
    partial.weighted,
  ].map(array => array.buffer as ArrayBuffer)
  parentPort!.postMessage({ partial } satisfies PoolReply, transfer)
})
