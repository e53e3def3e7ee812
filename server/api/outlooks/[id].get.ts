import { IdParams } from '#shared/schemas/params'
import { readOutlook, sendStoredOutlook } from '~~/server/outlooks/read'

// One outlook as stored, with its provenance: immutable once done, so it carries an ETag (304 when the
// reader has it) and is gzip-encoded for readers that accept it. What changes while it is read
// (progress, site name, newer science, storylines) is GET /api/outlooks/[id]/status.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  // Another organisation's outlook answers 404 before any ETag is compared, so its validator never leaks.
  const outlook = await readOutlook(user, id)
  return sendStoredOutlook(event, outlook)
})
