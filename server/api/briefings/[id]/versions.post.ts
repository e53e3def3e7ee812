import { IdParams } from '#shared/schemas/params'
import { NewVersionSchema } from '#shared/schemas/briefings'
import { newBriefingVersion } from '~~/server/services/briefings'

// A new draft version that starts from this issued briefing and links back to it; with
// { fromLatestOutlooks: true } it uses the latest finished outlook of each of its scenarios. No body
// starts from the same outlooks.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const sent
    = Number(getRequestHeader(event, 'content-length') ?? 0) > 0
      || getRequestHeader(event, 'transfer-encoding') !== undefined
  const options = sent ? await readValidBody(event, NewVersionSchema) : { fromLatestOutlooks: false }
  const draft = await newBriefingVersion(planner, id, options)
  setResponseStatus(event, 201)
  return draft
})
