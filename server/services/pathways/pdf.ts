import type { Content, TDocumentDefinitions } from 'pdfmake/interfaces'
import { pathwayChartLayout, pathwayChartSvg } from '#shared/pathways/chart'
import type { DecisionSpread, StepDecision } from '#shared/pathways/decisions'
import { chartYears, spreadSentence, type PathwaySnapshot } from '#shared/pathways/snapshot'
import { PATHWAY_TEXT } from '#shared/pathways/text'
import type { Language } from '#shared/wording/chance'
import { dateLocale } from '#shared/wording/dates'
import type { PathwaysView } from './view'

// The pathways of a site as a PDF: the main message, then per pathway and tolerance the chart (drawn
// as SVG on the server, shared/pathways/chart.ts) beside its table, the measures, the decision
// records, what it rests on and the cautions.

const INK = '#0b1a23'
const MUTED = '#5d5036'
const ACCENT = '#1c5a6d'
const CAUTION = '#9a3222'
const CHART_WIDTH = 500

function table(head: string[], rows: Array<Array<string | Content>>, widths?: (string | number)[]): Content {
  return {
    table: {
      headerRows: 1,
      widths: widths ?? head.map(() => '*'),
      body: [head.map(text => ({ text, bold: true, fillColor: '#f2eee3' })), ...rows],
    },
    layout: { hLineColor: () => '#e4dcc7', vLineColor: () => '#e4dcc7', paddingTop: () => 3, paddingBottom: () => 3 },
    fontSize: 8.5,
  }
}

/** How the body's headings are drawn: the pathways PDF gives each pathway a page heading, a briefing a sub-heading. */
interface BodyOptions { chartWidth: number, heading: (text: string) => Content }

const pageHeading = (text: string): Content => ({ text, style: 'h2', margin: [0, 14, 0, 4], headlineLevel: 1 })

/**
 * Each pathway (the main message per tolerance, the chart drawn as SVG beside its table), then the
 * measures, the decision records with what each rests on, the method and the outlooks used.
 */
export function pathwaysBody(
  snapshot: PathwaySnapshot,
  language: Language,
  options: BodyOptions = { chartWidth: CHART_WIDTH, heading: pageHeading },
): Content[] {
  const text = PATHWAY_TEXT[language]
  const names = Object.fromEntries(snapshot.measures.map(m => [m.id, m.name]))
  const percent = (value: number) => `${Math.round(value * 100)} %`
  const year = (value: number | null, horizon: number) => value === null ? text.afterHorizon(horizon) : String(value)
  const scenarios = snapshot.scenarios.map(s => s.scenario)
  const { startYear, endYear } = chartYears(snapshot)
  const spreadLine = (s: DecisionSpread) => {
    const { main, extra } = spreadSentence(s, names, text)
    return {
      text: [
        { text: main, bold: true },
        extra ? ` ${extra}` : '',
        s.alreadyLate ? { text: ` (${text.alreadyLate})`, color: CAUTION, bold: true } : '',
      ],
    }
  }
  const decisionRows = (decisions: StepDecision[]) => decisions.map(d => [
    names[d.fromMeasureId] ?? '', names[d.toMeasureId] ?? '', d.scenario, year(d.tippingYear, d.horizon),
    d.tippingYear === null ? '—' : `${year(d.tippingEarliest, d.horizon)}–${year(d.tippingLatest, d.horizon)}`,
    text.years(d.leadTimeYears), `${year(d.decisionYear, d.horizon)}${d.alreadyLate ? ` (${text.alreadyLate})` : ''}`,
  ])

  const pathways: Content[] = snapshot.pathways.flatMap(pathway => [
    options.heading(pathway.name),
    ...(pathway.illustrative
      ? [{ text: text.illustrative, bold: true, color: CAUTION, margin: [0, 0, 0, 4] } as Content]
      : []),
    ...pathway.tolerances.flatMap((tolerance): Content[] => {
      const decisions = pathway.decisions.filter(d => d.tolerance === tolerance)
      const layout = pathwayChartLayout({
        measures: pathway.measureIds.map(id => ({ id, name: names[id] ?? '' })),
        scenarios,
        decisions,
        startYear,
        endYear,
        currentYear: snapshot.currentYear,
      })
      const title = `${pathway.name}: ${text.tolerance(percent(tolerance))}`
      const svg = pathwayChartSvg(layout, { title, ...text.chart, font: PDF_FONT })
      return [
        {
          stack: [
            { text: text.tolerance(percent(tolerance)), bold: true, margin: [0, 6, 0, 2] },
            { ul: pathway.spread.filter(s => s.tolerance === tolerance).map(spreadLine), margin: [0, 0, 0, 4] },
            { svg, width: options.chartWidth },
          ],
          unbreakable: true,
        },
        table(text.tableHead, decisionRows(decisions), ['*', '*', 'auto', 'auto', 'auto', 'auto', 'auto']),
      ]
    }),
  ])

  const records: Content[] = snapshot.records.length
    ? [
        table(
          text.recordsHead,
          snapshot.records.map(r => [
            `${names[r.measureId] ?? ''} (← ${names[r.fromMeasureId] ?? ''})`,
            `${r.scenario}, ${percent(r.tolerance)}`,
            year(r.tippingYear, r.horizon),
            year(r.decisionYear, r.horizon),
            {
              stack: [
                r.rationale,
                {
                  text: text.restsOn(
                    r.outlookInputHash,
                    r.releases.map(x => `${x.component} v${x.version}`).join(', '),
                    r.engineVersion,
                  ),
                  fontSize: 7,
                  color: MUTED,
                },
              ],
            } as Content,
            `${r.decidedByName}, ${new Date(r.decidedAt).toLocaleDateString(dateLocale(language), { dateStyle: 'medium' })}`,
            r.reviewDate,
          ]),
          ['auto', 'auto', 'auto', 'auto', '*', 'auto', 'auto'],
        ),
      ]
    : [{ text: text.recordsNone, color: MUTED }]

  return [
    ...(snapshot.scenarios.length ? [] : [{ text: text.noOutlooks, color: CAUTION } as Content]),
    ...pathways,
    options.heading(text.measuresTitle),
    table(
      text.measuresHead(snapshot.site.referenceLevel),
      snapshot.measures.map(m => [
        m.name,
        m.height === null ? text.noHeight : `${m.height.toFixed(2)} m`,
        m.height === null ? '—' : (text.kinds[m.kind] ?? m.kind),
        text.years(m.leadTimeYears),
        m.designLifeYears === null ? '—' : text.years(m.designLifeYears),
        m.costBand ? (text.costs[m.costBand] ?? m.costBand) : '—',
      ]),
      ['*', 'auto', 'auto', 'auto', 'auto', 'auto'],
    ),
    options.heading(text.recordsTitle),
    ...records,
    { text: text.method, margin: [0, 10, 0, 2], fontSize: 9 },
    ...snapshot.scenarios.map(
      s =>
        ({
          text: text.basis(s.scenario, s.inputHash, s.releases.map(r => `${r.component} v${r.version}`).join(', ')),
          fontSize: 8,
          color: MUTED,
        }) as Content,
    ),
  ]
}

/** The pathway cautions, read together or not at all. */
export function pathwayCautions(language: Language, heading: Content): Content {
  const text = PATHWAY_TEXT[language]
  return { stack: [heading, { ul: text.cautions, color: CAUTION }], unbreakable: true }
}

export function pathwaysPdfDefinition(view: PathwaysView, language: Language): TDocumentDefinitions {
  const text = PATHWAY_TEXT[language]
  const content: Content[] = [
    { text: text.kind.toUpperCase(), style: 'kicker' },
    { text: text.title(view.site.name), style: 'h1' },
    { text: text.intro, margin: [0, 4, 0, 4] },
    ...pathwaysBody(view, language),
    pathwayCautions(language, { text: text.cautionsTitle, style: 'h2', margin: [0, 14, 0, 4] }),
  ]

  return {
    pageSize: 'A4',
    pageMargins: [48, 56, 48, 56],
    language,
    tagged: true,
    displayTitle: true,
    info: { title: text.title(view.site.name), creator: 'Brinkwater', producer: 'Brinkwater' },
    defaultStyle: { font: PDF_FONT, fontSize: 10, lineHeight: 1.25, color: INK },
    styles: {
      kicker: { fontSize: 9, bold: true, color: ACCENT, characterSpacing: 1 },
      h1: { fontSize: 20, bold: true, margin: [0, 2, 0, 2] },
      h2: { fontSize: 13, bold: true, color: ACCENT },
    },
    footer: (page: number, pages: number) => ({
      text: text.page(page, pages),
      alignment: 'right',
      fontSize: 8,
      color: MUTED,
      margin: [48, 16, 48, 0],
    }),
    content,
    pageBreakBefore: (node, nodes) => node.headlineLevel === 1 && nodes.getFollowingNodesOnPage().length === 0,
  }
}
