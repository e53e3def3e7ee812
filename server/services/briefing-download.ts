import type { H3Event } from 'h3'
import { z } from 'zod'
import type { BriefingDocument } from '#shared/briefing/document'
import { briefingPdfDefinition } from './briefing-pdf'

const Query = z.object({ paper: z.enum(['a4', 'letter'], { error: 'paper must be a4 or letter.' }).default('a4') })

/** Streams a briefing as a PDF with a file name that says what it is. */
export async function sendBriefingPdf(event: H3Event, doc: BriefingDocument, live: { path: string, signIn: boolean }) {
  const { paper } = readValidQuery(event, Query)
  // The app's configured address, never the request's Host header: a forged Host must not put its
  // own link into a briefing that is shared and kept.
  const link = { url: `${appUrl()}${live.path}`, signIn: live.signIn }
  const pdf = await renderPdf(briefingPdfDefinition(doc, link, paper === 'letter' ? 'LETTER' : 'A4'))
  const date = (doc.meta.issuedAt ?? new Date().toISOString()).slice(0, 10)
  const name
    = `brinkwater-${doc.meta.siteName}-${doc.meta.scenario}-v${doc.meta.version}-${doc.meta.issuedAt ? date : 'draft'}`
      .toLowerCase()
      .normalize('NFKD')
      .replace(/[^\w.-]+/g, '-')
  setResponseHeader(event, 'content-type', 'application/pdf')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${name}.pdf"`)
  setResponseHeader(event, 'cache-control', 'private, no-store')
  return pdf
}
