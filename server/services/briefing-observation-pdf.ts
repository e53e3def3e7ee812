import type { Content } from 'pdfmake/interfaces'
import type { BriefingDocument } from '#shared/briefing/document'

// The PDF's lines for the outlook updated by the site's gauge record, closing the basis section as the
// page does (components/briefing/BriefingObservationUpdate.vue); nothing when the outlook was not weighted.
export function observationUpdatePdf(doc: BriefingDocument, muted: string): Content[] {
  const update = doc.observationUpdate
  if (!update) return []
  return [
    { text: update.title, bold: true, margin: [0, 8, 0, 2] },
    ...update.lines.map(line => ({ text: line, margin: [0, 0, 0, 2] }) as Content),
    ...update.method.map(sentence => ({ text: sentence, color: muted, margin: [0, 2, 0, 0] }) as Content),
  ]
}
