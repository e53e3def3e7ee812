import { parentPort, workerData } from 'node:worker_threads'
import { CsvError, type CsvIssue } from '../../shared/releases/csv'
import type { CheckReply } from '../utils/checking-thread'
import {
  parseLandMotionDrawsCsv,
  summariseLandDraws,
  type LandDrawsSummary,
} from '../../shared/observations/land-motion-draws'

// A site's land-motion draws upload, parsed, checked and summarised on a thread of its own: 100,000
// rows take about a third of a second, which on the request thread every other request would wait out.
// The rates go back already written as JSON, as the jsonb column stores them, which saves the request
// thread writing 100,000 numbers again.

export interface LandMotionDrawsWork { csv: string }

export interface LandMotionDrawsReply extends CheckReply {
  /** The rates in draw order (index 0 is draw 1), as a JSON array. */
  drawsJson?: string
  summary?: LandDrawsSummary
  issues?: CsvIssue[]
}

const { csv } = workerData as LandMotionDrawsWork
try {
  const rates = parseLandMotionDrawsCsv(csv)
  const reply: LandMotionDrawsReply = { drawsJson: JSON.stringify(rates), summary: summariseLandDraws(rates) }
  parentPort!.postMessage(reply)
}
catch (error) {
  const reply: LandMotionDrawsReply = error instanceof CsvError
    ? { issues: error.issues }
    : { error: error instanceof Error ? error.message : String(error) }
  parentPort!.postMessage(reply)
}
