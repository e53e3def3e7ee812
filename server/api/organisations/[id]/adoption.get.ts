import { IdParams } from '#shared/schemas/params'
import { adoptionView } from '~~/server/services/adoptions'

// The science an organisation adopted for its outlooks, per scenario, with what else is published
// and offered. Any signed-in member of the organisation may read it; another organisation's is 404.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  return adoptionView(user, id)
})
