import { z } from 'zod'
import { IdParams } from '#shared/schemas/params'
import { pathwaysPdfDefinition } from '~~/server/services/pathways/pdf'
import { pathwaysView } from '~~/server/services/pathways/view'
import { languageOf } from '#shared/wording/translate'

const Query = z.object({ language: z.enum(['en', 'es'], { error: 'Choose en or es.' }).optional() })

// The site's pathways, decisions and records as a PDF, in the reader's language unless asked.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const { language } = readValidQuery(event, Query)
  const view = await pathwaysView(user, id)
  const pdf = await renderPdf(pathwaysPdfDefinition(view, language ?? languageOf(user.locale)))
  const name = `brinkwater-pathways-${view.site.name}`.toLowerCase().normalize('NFKD').replace(/[^\w.-]+/g, '-')
  setResponseHeader(event, 'content-type', 'application/pdf')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${name}.pdf"`)
  setResponseHeader(event, 'cache-control', 'private, no-store')
  return pdf
})
