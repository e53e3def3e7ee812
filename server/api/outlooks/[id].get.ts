import { IdParams } from '#shared/schemas/users'
import { getOutlookBody } from '~~/server/outlooks/read'

// One outlook with its provenance, its progress while running, and whether newer science exists.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const [stored, live] = await getOutlookBody(user, id)
  // Written as two pieces: the stored one is the same bytes for every reader of a finished outlook,
  // so a crowd of readers does not make a 120 kB copy each.
  const response = event.node.res
  response.setHeader('content-type', 'application/json')
  response.setHeader('content-length', stored.length + live.length)
  response.write(stored)
  response.end(live)
})
