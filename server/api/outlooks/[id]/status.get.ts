import { IdParams } from '#shared/schemas/params'
import { outlookStatus } from '~~/server/outlooks/status'

// What changes about an outlook while it is read: progress while running, the site's name and datum
// name, newer and offered science, storylines. Small, always fresh; the page polls it while running.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  return outlookStatus(user, id)
})
