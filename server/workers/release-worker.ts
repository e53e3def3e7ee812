import { parentPort, workerData } from 'node:worker_threads'
import { CsvError } from '../../shared/releases/csv'
import { ReleaseContentError, buildRelease } from '../../shared/releases/content'
import { previewYears, releaseBands } from '../../shared/releases/summary'
import { EngineInputError } from '../../shared/engine'
import { ReleaseContentSchema, type ReleaseContentInput } from '../../shared/schemas/releases'
import { parseJsonObject, zodFieldIssues, type FieldIssue } from '../utils/json-body'

// One release's engine work (convert, check, bands), on a thread of its own so a large release
// never holds up the requests of everyone else; the server gives it a time budget and ends it after.

// A preview sends the body as it came (`raw`): parsing and checking two million numbers would
// otherwise hold the request thread for seconds, so that happens here too, and only the bands go back.
export type ReleaseWork
  = { input: ReleaseContentInput, years: 'preview' | 'anchors' } | { raw: string | undefined, years: 'preview' }

function contentOf(work: ReleaseWork): { input: ReleaseContentInput } | { issues: FieldIssue[] } {
  if ('input' in work) return { input: work.input }
  const parsed = parseJsonObject(work.raw)
  if ('issues' in parsed) return parsed
  const result = ReleaseContentSchema.safeParse(parsed.body)
  return result.success ? { input: result.data } : { issues: zodFieldIssues(result.error) }
}

const work = workerData as ReleaseWork
try {
  const content = contentOf(work)
  if ('issues' in content) {
    parentPort!.postMessage({ issues: content.issues })
  }
  else {
    const release = buildRelease(content.input)
    const bands = releaseBands(release, work.years === 'preview' ? previewYears(release) : release.anchorYears)
    parentPort!.postMessage('raw' in work ? { anchorYears: release.anchorYears, bands } : { release, bands })
  }
}
catch (error) {
  const issues
    = error instanceof ReleaseContentError || error instanceof CsvError
      ? error.issues
      : error instanceof EngineInputError
        ? error.issues.map(issue => ({ field: issue.path || 'body', message: issue.message }))
        : undefined
  parentPort!.postMessage(issues ? { issues } : { error: error instanceof Error ? error.message : String(error) })
}
