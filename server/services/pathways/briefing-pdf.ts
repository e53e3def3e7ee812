import type { Content } from 'pdfmake/interfaces'
import type { BriefingPathwaySection } from '#shared/briefing/pathway-section'
import { PATHWAY_TEXT } from '#shared/pathways/text'
import type { Language } from '#shared/wording/chance'
import { dateLocale } from '#shared/wording/dates'
import { pathwayCautions, pathwaysBody } from './pdf'

// A briefing's pathways section in its PDF: the same body as the pathways PDF (chart beside its
// table, measures, records and what they rest on), under one heading, with its own cautions.

const MUTED = '#5d5036'

export function briefingPathwaysPdf(
  section: BriefingPathwaySection,
  language: Language,
  chartWidth: number,
): Content[] {
  const text = PATHWAY_TEXT[language]
  const asOf = section.asOf
    ? text.briefing.frozen(
        new Date(section.asOf).toLocaleDateString(dateLocale(language), { dateStyle: 'long' }),
        section.currentYear,
      )
    : text.briefing.live
  return [
    {
      stack: [
        { text: text.briefing.title, style: 'h2', margin: [0, 14, 0, 6] },
        { text: text.intro, margin: [0, 0, 0, 4] },
        { text: asOf, color: MUTED, fontSize: 9 },
      ],
      headlineLevel: 1,
    },
    ...pathwaysBody(section, language, {
      chartWidth,
      heading: title => ({ text: title, bold: true, fontSize: 12, margin: [0, 10, 0, 2], headlineLevel: 1 }),
    }),
    pathwayCautions(language, { text: text.cautionsTitle, bold: true, margin: [0, 10, 0, 2] }),
  ]
}
