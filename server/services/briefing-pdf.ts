import type { Content, TDocumentDefinitions } from 'pdfmake/interfaces'
import { extremesTable, type BriefingDocument } from '#shared/briefing/document'
import { dateLocale } from '#shared/wording/dates'
import { exceedanceChartOption, fanChartOption } from '#shared/briefing/charts'
import { BRIEFING_TEXT } from '#shared/briefing/text'

// Lays a briefing document out as a PDF: the same sections, in the same order, as the page.

export type Paper = 'A4' | 'LETTER'

const INK = '#0b1a23'
const MUTED = '#5d5036'
const ACCENT = '#1c5a6d'
const CAUTION = '#9a3222'

function heading(number: number, title: string): Content {
  // headlineLevel lets pageBreakBefore keep a heading off the foot of a page.
  return { text: `${number}. ${title}`, style: 'h2', margin: [0, 14, 0, 6], headlineLevel: 1 }
}

function table(head: string[] | null, rows: string[][], widths?: (string | number)[]): Content {
  const header = head ? [head.map(text => ({ text, bold: true, fillColor: '#f2eee3' }))] : []
  return {
    table: { headerRows: head ? 1 : 0, widths: widths ?? rows[0]!.map(() => '*'), body: [...header, ...rows] },
    layout: { hLineColor: () => '#e4dcc7', vLineColor: () => '#e4dcc7', paddingTop: () => 3, paddingBottom: () => 3 },
    fontSize: 9,
  }
}

export function briefingPdfDefinition(doc: BriefingDocument, absoluteLink: string, paper: Paper): TDocumentDefinitions {
  const text = BRIEFING_TEXT[doc.meta.language]
  const extremes = extremesTable(doc)
  const meta = doc.meta
  const chartWidth = paper === 'A4' ? 500 : 510
  const issued = meta.issuedAt ? new Date(meta.issuedAt).toLocaleDateString(dateLocale(meta.language), { dateStyle: 'long' }) : text.draftMark

  const content: Content[] = [
    { text: text.documentKind.toUpperCase(), style: 'kicker' },
    { text: meta.title, style: 'h1' },
    { text: `${meta.siteName} · ${meta.scenario} · ${issued} · ${text.provenance.version} ${meta.version}`, color: MUTED, margin: [0, 2, 0, 4] },
    ...(meta.audience ? [{ text: `${text.provenance.audience}: ${meta.audience}`, color: MUTED } as Content] : []),
    ...(meta.illustrative ? [{ text: text.illustrative, bold: true, color: CAUTION, margin: [0, 6, 0, 0] } as Content] : []),

    heading(1, text.sections.summary),
    { text: doc.summary.intro, margin: [0, 0, 0, 6] },
    { ul: doc.summary.lines, margin: [0, 0, 0, 6] },
    { ul: doc.summary.ranges },
    ...(doc.storylines?.length
      ? [
          { text: text.storylines.title, bold: true, margin: [0, 8, 0, 2] } as Content,
          { text: text.storylines.intro, margin: [0, 0, 0, 4] } as Content,
          ...doc.storylines.flatMap(storyline => [
            { text: storyline.name, bold: true, margin: [0, 2, 0, 0] } as Content,
            { text: storyline.description, fontSize: 9, color: MUTED } as Content,
            { ul: storyline.lines, margin: [0, 2, 0, 2] } as Content,
            { text: storyline.source, fontSize: 9, color: MUTED } as Content,
          ]),
        ]
      : []),
    ...(meta.localContext ? [{ text: text.sections.context, bold: true, margin: [0, 8, 0, 2] } as Content, { text: meta.localContext }] : []),

    // A chart's title and its drawing stay on one page, and the section heading with the first.
    { stack: [heading(2, text.sections.charts), { text: text.chartExceedance, bold: true }, { svg: chartSvg(exceedanceChartOption(doc, PDF_FONT), chartWidth, 250), width: chartWidth }], unbreakable: true },
    { stack: [{ text: text.chartFan, bold: true, margin: [0, 8, 0, 0] }, { svg: chartSvg(fanChartOption(doc, PDF_FONT), chartWidth, 250), width: chartWidth },
      ...(doc.extrapolation && doc.charts.fan.outerExtrapolated?.some(Boolean) ? [{ text: doc.extrapolation, fontSize: 9, color: MUTED }] : [])], unbreakable: true },

    heading(3, text.sections.table),
    table([text.tableHead.scenario, text.tableHead.threshold, text.tableHead.measure, ...doc.table.years.map(String)],
      doc.table.rows.map(row => [row.scenario, `${row.threshold} (${row.height})`, row.measure ?? '', ...row.chances.map(c => c.text)]),
      ['auto', '*', '*', ...doc.table.years.map(() => 'auto')]),
    ...(doc.extrapolation ? [{ text: doc.extrapolation, fontSize: 9, color: MUTED, margin: [0, 4, 0, 0] } as Content] : []),
    ...(extremes
      ? [{
          stack: [
            { text: text.extremesTitle, bold: true, margin: [0, 10, 0, 4] },
            table(extremes.head, extremes.rows, extremes.head.map((_, index) => (index === 2 ? '*' : 'auto'))),
            { text: text.extremesNote, fontSize: 9, color: MUTED, margin: [0, 4, 0, 0] },
          ],
          unbreakable: true,
        } as Content]
      : []),

    heading(4, text.sections.basis),
    table([text.basisHead.component, text.basisHead.scenario, text.basisHead.version, text.basisHead.state, text.basisHead.scale, text.basisHead.citation],
      doc.basis.releases.map(r => [r.component, r.scenario, String(r.version), r.state, r.scale, r.citation]),
      ['auto', 'auto', 'auto', 'auto', 'auto', '*']),
    ...(doc.basis.datum ? [{ text: doc.basis.datum, margin: [0, 6, 0, 2] } as Content] : []),
    { text: doc.basis.landMotion, margin: [0, 6, 0, 2] },
    { text: doc.basis.sampling, margin: [0, 0, 0, 2] },
    ...doc.basis.notes.map(note => ({ text: note, color: MUTED }) as Content),
    ...doc.basis.method.map(sentence => ({ text: sentence, margin: [0, 2, 0, 0] }) as Content),

    // The cautions are read together or not at all.
    { stack: [heading(5, text.sections.cautions), { ul: doc.cautions, color: CAUTION }], unbreakable: true },

    heading(6, text.sections.provenance),
    table(null, [
      [text.provenance.issued, issued],
      [text.provenance.version, String(meta.version) + (meta.previousVersion ? ` (${text.provenance.previous} ${meta.previousVersion})` : '')],
      [text.provenance.inputHash, meta.inputs.map(input => `${input.scenario}: ${input.inputHash}`).join('\n')],
      [text.provenance.link, absoluteLink],
    ], ['auto', '*']),
  ]

  return {
    pageSize: paper,
    pageMargins: [48, 56, 48, 56],
    language: meta.language,
    tagged: true,
    displayTitle: true,
    info: { title: meta.title, subject: `${text.documentKind}: ${meta.siteName}, ${meta.scenario}`, creator: 'Brinkwater', producer: 'Brinkwater' },
    defaultStyle: { font: PDF_FONT, fontSize: 10.5, lineHeight: 1.25, color: INK },
    styles: {
      kicker: { fontSize: 9, bold: true, color: ACCENT, characterSpacing: 1 },
      h1: { fontSize: 22, bold: true, margin: [0, 2, 0, 2] },
      h2: { fontSize: 14, bold: true, color: ACCENT },
    },
    header: (page: number) => page > 1 ? { text: `${meta.title} · ${meta.siteName}`, fontSize: 8, color: MUTED, margin: [48, 24, 48, 0] } : null,
    footer: (page: number, pages: number) => ({
      columns: [
        { text: meta.issuedAt ? `Brinkwater · ${issued}` : text.draftMark, fontSize: 8, color: meta.issuedAt ? MUTED : CAUTION },
        { text: text.page(page, pages), alignment: 'right', fontSize: 8, color: MUTED },
      ],
      margin: [48, 16, 48, 0],
    }),
    content,
    pageBreakBefore: (node, nodes) => node.headlineLevel === 1 && nodes.getFollowingNodesOnPage().length === 0,
  }
}
