import { finishOutlook } from './finish'
import { planOutlook } from './plan'
import { runBlocks } from './run'
import type { OutlookResult } from './types'

/** Validates, samples every block on this thread and summarises: the whole outlook in one call. */
export function runOutlook(input: unknown): OutlookResult {
  const plan = planOutlook(input)
  return finishOutlook(plan, runBlocks(plan, 0, plan.blockCount))
}
