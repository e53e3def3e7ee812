import { OutlookRequestSchema } from '#shared/schemas/sites'
import { IdParams } from '#shared/schemas/params'
import { requestOutlook } from '~~/server/outlooks/queue'

// Compute (or find the stored) outlook for a scenario. 200 when served from the store, 201 when
// computed now, 202 when it is still running (wait: false) — follow GET /api/outlooks/[id].
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const request = await readValidBody(event, OutlookRequestSchema)
  const outcome = await requestOutlook(planner, id, request)
  if (outcome.run && request.wait) await outcome.run
  setResponseStatus(event, outcome.cached ? 200 : outcome.run && !request.wait ? 202 : 201)
  return { id: outcome.id, cached: outcome.cached }
})
