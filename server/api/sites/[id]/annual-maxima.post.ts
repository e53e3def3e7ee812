import { AnnualMaximaSchema } from '#shared/schemas/sites'
import { IdParams } from '#shared/schemas/users'
import { fitAnnualMaximaCsv } from '#shared/releases/annual-maxima'
import { replaceAnnualMaxima } from '~~/server/services/sites'

// Annual maximum water levels (CSV year,value) → a Gumbel fit by L-moments, stored on the site.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const { csv } = await readValidBody(event, AnnualMaximaSchema)
  const fit = asBadRequest(() => fitAnnualMaximaCsv(csv))
  await replaceAnnualMaxima(planner, id, fit)
  return { gumbel: fit.gumbel, sampleSize: fit.sampleSize, method: 'L-moments' }
})
