import { listRecomputations } from '~~/server/services/recomputation-list'

// Recomputations of many sites (after new science, or asked for here) and how far each has got.
export default defineEventHandler(async (event) => {
  await requireOperator(event)
  return listRecomputations()
})
