import { parentPort, workerData } from 'node:worker_threads'
import { CsvError } from '../../shared/releases/csv'
import { ReleaseContentError, buildRelease } from '../../shared/releases/content'
import { previewYears, releaseBands } from '../../shared/releases/summary'
import { EngineInputError } from '../../shared/engine'
import type { ReleaseContentInput } from '../../shared/schemas/releases'

// One release's engine work (convert, check, bands), on a thread of its own so a large release
// never holds up the requests of everyone else; the server gives it a time budget and ends it after.

export interface ReleaseWork { input: ReleaseContentInput, years: 'preview' | 'anchors' }

const { input, years } = workerData as ReleaseWork
try {
  const release = buildRelease(input)
  const bands = releaseBands(release, years === 'preview' ? previewYears(release) : release.anchorYears)
  parentPort!.postMessage({ release, bands })
}
catch (error) {
  const issues = error instanceof ReleaseContentError || error instanceof CsvError
    ? error.issues
    : error instanceof EngineInputError ? error.issues.map(issue => ({ field: issue.path || 'body', message: issue.message })) : undefined
  parentPort!.postMessage(issues ? { issues } : { error: error instanceof Error ? error.message : String(error) })
}
