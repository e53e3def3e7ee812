import type { Content, TDocumentDefinitions } from 'pdfmake/interfaces'
import { extremesTable, type BriefingDocument } from '#shared/briefing/document'
import { dateLocale } from '#shared/wording/dates'
import { exceedanceChartOption, fanChartOption } from '#shared/briefing/charts'
import { BRIEFING_TEXT } from '#shared/briefing/text'
import { pieceSizes } from '#shared/briefing/table-pieces'
import { observationUpdatePdf } from './briefing-observation-pdf'
import { briefingPathwaysPdf } from './pathways/briefing-pdf'

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

type Cell = string | Content

/**
 * A table as unbreakable pieces, each with its header: a header is never left at the foot of a page
 * and a row never stands alone on one. `lead` (a heading, a caption) keeps to the first piece.
 */
function table(
  head: string[] | null,
  rows: Cell[][],
  options: { widths?: (string | number)[], lead?: Content[] } = {},
): Content {
  // pdfmake writes its layout into the nodes it lays out: each piece gets a header of its own.
  const header = () => (head ? [head.map(text => ({ text, bold: true, fillColor: '#f2eee3' }))] : [])
  let start = 0
  const pieces = pieceSizes(rows.length).map((size, i) => {
    const body = rows.slice(start, (start += size))
    const piece: Content = {
      table: {
        headerRows: head ? 1 : 0,
        keepWithHeaderRows: head ? 1 : 0,
        dontBreakRows: true,
        widths: options.widths ?? rows[0]!.map(() => '*'),
        body: [...header(), ...body],
      },
      layout: { hLineColor: () => '#e4dcc7', vLineColor: () => '#e4dcc7', paddingTop: () => 3, paddingBottom: () => 3 },
      fontSize: 9,
      margin: [0, i ? 6 : 0, 0, 0],
    } as Content
    return { stack: [...(i === 0 ? (options.lead ?? []) : []), piece], unbreakable: true } as Content
  })
  return { stack: pieces }
}

/** Section 1: the findings, one sentence each, then thresholds × years; earlier briefings had their lines. */
function summary(doc: BriefingDocument): Content[] {
  const text = BRIEFING_TEXT[doc.meta.language]
  const grid = doc.summary.grid
  return [
    ...(doc.summary.findings ? [{ ul: doc.summary.findings, margin: [0, 0, 0, 8] } as Content] : []),
    ...(doc.summary.lines ? [{ ul: doc.summary.lines, margin: [0, 0, 0, 6] } as Content] : []),
    ...(doc.summary.ranges ? [{ ul: doc.summary.ranges } as Content] : []),
    ...(grid
      ? [
          table(
            [text.gridThreshold, ...grid.years.map(String)],
            grid.rows.map(row => [
              `${row.threshold} (${row.height})`,
              ...row.chances.map(c => ({ text: c.text, alignment: 'right' }) as Content),
            ]),
            {
              widths: ['*', ...grid.years.map(() => 'auto')],
              lead: [{ text: grid.caption, fontSize: 9, color: MUTED, margin: [0, 0, 0, 3] }],
            },
          ),
        ]
      : []),
  ]
}

/** For the engineer, after the table of chances: each threshold in one sentence, and the ranges. */
function detail(doc: BriefingDocument): Content[] {
  if (!doc.detail) return []
  const text = BRIEFING_TEXT[doc.meta.language]
  // headlineLevel keeps the title off the foot of a page, as for section headings.
  return [
    { text: text.detailTitle, bold: true, margin: [0, 10, 0, 4], headlineLevel: 1 },
    { ul: [...doc.detail.lines, ...doc.detail.ranges] },
  ]
}

export function briefingPdfDefinition(
  doc: BriefingDocument,
  live: { url: string, signIn: boolean },
  paper: Paper,
): TDocumentDefinitions {
  const text = BRIEFING_TEXT[doc.meta.language]
  const extremes = extremesTable(doc)
  const meta = doc.meta
  const chartWidth = paper === 'A4' ? 500 : 510
  const issued = meta.issuedAt
    ? new Date(meta.issuedAt).toLocaleDateString(dateLocale(meta.language), { dateStyle: 'long' })
    : text.draftMark

  const content: Content[] = [
    { text: text.documentKind.toUpperCase(), style: 'kicker' },
    { text: meta.title, style: 'h1' },
    {
      text: `${meta.siteName} · ${meta.scenario} · ${issued} · ${text.provenance.version} ${meta.version}`,
      color: MUTED,
      margin: [0, 2, 0, 0],
    },
    ...(meta.organisation
      ? [{ text: text.issuedBy(meta.organisation, meta.author ?? null), color: MUTED } as Content]
      : []),
    ...(meta.heights ? [{ text: meta.heights, color: MUTED } as Content] : []),
    ...(meta.audience
      ? [{ text: `${text.provenance.audience}: ${meta.audience}`, color: MUTED, margin: [0, 4, 0, 0] } as Content]
      : []),
    ...(meta.illustrative
      ? [{ text: text.illustrative, bold: true, color: CAUTION, margin: [0, 6, 0, 0] } as Content]
      : []),

    heading(1, text.sections.summary),
    { text: doc.summary.intro, margin: [0, 0, 0, 6] },
    ...summary(doc),
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
    ...(meta.localContext
      ? [{ text: text.sections.context, bold: true, margin: [0, 8, 0, 2] } as Content, { text: meta.localContext }]
      : []),

    // A chart's title and its drawing stay on one page, and the section heading with the first.
    {
      stack: [
        heading(2, text.sections.charts),
        { text: text.chartExceedance, bold: true },
        { svg: chartSvg(exceedanceChartOption(doc, PDF_FONT), chartWidth, 250), width: chartWidth },
      ],
      unbreakable: true,
    },
    {
      stack: [
        { text: text.chartFan, bold: true, margin: [0, 8, 0, 0] },
        { svg: chartSvg(fanChartOption(doc, PDF_FONT), chartWidth, 250), width: chartWidth },
        ...(doc.extrapolation && doc.charts.fan.outerExtrapolated?.some(Boolean)
          ? [{ text: doc.extrapolation, fontSize: 9, color: MUTED }]
          : []),
      ],
      unbreakable: true,
    },

    table(
      [text.tableHead.scenario, text.tableHead.threshold, text.tableHead.measure, ...doc.table.years.map(String)],
      doc.table.rows.map(row => [
        row.scenario,
        `${row.threshold} (${row.height})`,
        row.measure ?? '',
        ...row.chances.map(c => ({ text: c.text, alignment: 'right' }) as Content),
      ]),
      { widths: ['auto', '*', '*', ...doc.table.years.map(() => 'auto')], lead: [heading(3, text.sections.table)] },
    ),
    ...(doc.extrapolation
      ? [{ text: doc.extrapolation, fontSize: 9, color: MUTED, margin: [0, 4, 0, 0] } as Content]
      : []),
    ...(extremes
      ? [
          {
            stack: [
              { text: text.extremesTitle, bold: true, margin: [0, 10, 0, 4] },
              table(extremes.head, extremes.rows, {
                widths: extremes.head.map((_, index) => (index === 2 ? '*' : 'auto')),
              }),
              { text: text.extremesNote, fontSize: 9, color: MUTED, margin: [0, 4, 0, 0] },
            ],
            unbreakable: true,
          } as Content,
        ]
      : []),
    ...detail(doc),
    ...(doc.pathways ? briefingPathwaysPdf(doc.pathways, meta.language, chartWidth) : []),

    table(
      [
        text.basisHead.component,
        text.basisHead.scenario,
        text.basisHead.version,
        text.basisHead.state,
        text.basisHead.scale,
        text.basisHead.citation,
      ],
      doc.basis.releases.map(r => [r.component, r.scenario, String(r.version), r.state, r.scale, r.citation]),
      { widths: ['auto', 'auto', 'auto', 'auto', 'auto', '*'], lead: [heading(4, text.sections.basis)] },
    ),
    ...(doc.basis.datum ? [{ text: doc.basis.datum, margin: [0, 6, 0, 2] } as Content] : []),
    { text: doc.basis.landMotion, margin: [0, 6, 0, 2] },
    { text: doc.basis.sampling, margin: [0, 0, 0, 2] },
    ...doc.basis.notes.map(note => ({ text: note, color: MUTED }) as Content),
    ...doc.basis.method.map(sentence => ({ text: sentence, margin: [0, 2, 0, 0] }) as Content),
    ...observationUpdatePdf(doc, MUTED),

    // The cautions are read together or not at all.
    { stack: [heading(5, text.sections.cautions), { ul: doc.cautions, color: CAUTION }], unbreakable: true },

    table(
      null,
      [
        [text.provenance.issued, issued],
        ...(meta.organisation ? [[text.provenance.organisation, meta.organisation]] : []),
        ...(meta.author ? [[text.provenance.author, meta.author]] : []),
        [
          text.provenance.version,
          String(meta.version) + (meta.previousVersion ? ` (${text.provenance.previous} ${meta.previousVersion})` : ''),
        ],
        [text.provenance.inputHash, meta.inputs.map(input => `${input.scenario}: ${input.inputHash}`).join('\n')],
        // A reader of a shared briefing opens its share link; the page inside needs an account, and says so.
        [
          text.provenance.link,
          {
            stack: [
              { text: live.url, link: live.url, color: ACCENT, decoration: 'underline' },
              ...(live.signIn ? [{ text: text.provenance.signIn(meta.organisation ?? ''), color: MUTED }] : []),
            ],
          },
        ],
      ],
      { widths: ['auto', '*'], lead: [heading(6, text.sections.provenance)] },
    ),
  ]

  return {
    pageSize: paper,
    pageMargins: [48, 56, 48, 56],
    language: meta.language,
    tagged: true,
    displayTitle: true,
    info: {
      title: meta.title,
      subject: `${text.documentKind}: ${meta.siteName}, ${meta.scenario}`,
      creator: 'Brinkwater',
      producer: 'Brinkwater',
    },
    defaultStyle: { font: PDF_FONT, fontSize: 10.5, lineHeight: 1.25, color: INK },
    styles: {
      kicker: { fontSize: 9, bold: true, color: ACCENT, characterSpacing: 1 },
      h1: { fontSize: 22, bold: true, margin: [0, 2, 0, 2] },
      h2: { fontSize: 14, bold: true, color: ACCENT },
    },
    header: (page: number) =>
      page > 1
        ? { text: `${meta.title} · ${meta.siteName}`, fontSize: 8, color: MUTED, margin: [48, 24, 48, 0] }
        : null,
    footer: (page: number, pages: number) => ({
      columns: [
        {
          text: meta.issuedAt ? `${meta.organisation ?? 'Brinkwater'} · ${issued}` : text.draftMark,
          fontSize: 8,
          color: meta.issuedAt ? MUTED : CAUTION,
        },
        { text: text.page(page, pages), alignment: 'right', fontSize: 8, color: MUTED },
      ],
      margin: [48, 16, 48, 0],
    }),
    content,
    pageBreakBefore: (node, nodes) => node.headlineLevel === 1 && nodes.getFollowingNodesOnPage().length === 0,
  }
}
