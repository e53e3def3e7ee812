import { parentPort } from 'node:worker_threads'
import { runBlocks, type OutlookPartial, type OutlookPlan } from '../../shared/engine'

// A pool thread: keeps the last plan it was sent and samples the block ranges it is asked for.

let plan: OutlookPlan | null = null

parentPort!.on('message', (message: { plan?: OutlookPlan; firstBlock?: number; blockCount?: number }) => {
  if (message.plan) {
    plan = message.plan
    parentPort!.postMessage({ ready: true })
    return
  }
  const partial: OutlookPartial = runBlocks(plan!, message.firstBlock!, message.blockCount!)
  parentPort!.postMessage({ partial }, [
    partial.cellCounts.buffer,
    partial.histogram.buffer,
    partial.minimum.buffer,
    partial.maximum.buffer,
    partial.blockSums.buffer,
  ])
})
