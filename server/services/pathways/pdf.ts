import type { Content, TDocumentDefinitions } from 'pdfmake/interfaces'
import { pathwayChartLayout, pathwayChartSvg } from '#shared/pathways/chart'
import type { DecisionSpread, StepDecision } from '#shared/pathways/decisions'
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

function table(head: string[], rows: string[][], widths?: (string | number)[]): Content {
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

export function pathwaysPdfDefinition(view: PathwaysView, language: Language): TDocumentDefinitions {
  const text = PATHWAY_TEXT[language]
  const names = Object.fromEntries(view.measures.map(m => [m.id, m.name]))
  const percent = (value: number) => `${Math.round(value * 100)} %`
  const year = (value: number | null, horizon: number) => value === null ? text.afterHorizon(horizon) : String(value)
  const scenarios = view.scenarios.map(s => s.scenario)
  const endYear = Math.max(view.currentYear + 10, ...view.scenarios.map(s => s.horizon))
  const startYear = Math.min(view.site.referenceEpoch, view.currentYear)
  const spreadLine = (s: DecisionSpread) => {
    const measure = names[s.toMeasureId] ?? ''
    const main = !s.earliest || !s.latest
      ? text.spreadNone(measure)
      : s.earliest.year === s.latest.year
        ? text.spreadSingle(measure, s.earliest.year, s.earliest.scenario)
        : text.spreadBetween(measure, s.earliest.year, s.earliest.scenario, s.latest.year, s.latest.scenario)
    const extra = s.notWithinHorizon.length
      ? ` ${text.notWithin(s.notWithinHorizon.map(n => n.scenario).join(', '), s.notWithinHorizon[0]!.horizon)}`
      : ''
    return {
      text: [
        { text: main, bold: true },
        extra,
        s.alreadyLate ? { text: ` (${text.alreadyLate})`, color: CAUTION, bold: true } : '',
      ],
    }
  }
  const decisionRows = (decisions: StepDecision[]) => decisions.map(d => [
    names[d.fromMeasureId] ?? '', names[d.toMeasureId] ?? '', d.scenario, year(d.tippingYear, d.horizon),
    d.tippingYear === null ? '—' : `${year(d.tippingEarliest, d.horizon)}–${year(d.tippingLatest, d.horizon)}`,
    text.years(d.leadTimeYears), `${year(d.decisionYear, d.horizon)}${d.alreadyLate ? ` (${text.alreadyLate})` : ''}`,
  ])

  const pathways: Content[] = view.pathways.flatMap(pathway => [
    { text: pathway.name, style: 'h2', margin: [0, 14, 0, 4], headlineLevel: 1 } as Content,
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
        currentYear: view.currentYear,
      })
      const title = `${pathway.name}: ${text.tolerance(percent(tolerance))}`
      const svg = pathwayChartSvg(layout, { title, ...text.chart, font: PDF_FONT })
      return [
        {
          stack: [
            { text: text.tolerance(percent(tolerance)), bold: true, margin: [0, 6, 0, 2] },
            { ul: pathway.spread.filter(s => s.tolerance === tolerance).map(spreadLine), margin: [0, 0, 0, 4] },
            { svg, width: CHART_WIDTH },
          ],
          unbreakable: true,
        },
        table(text.tableHead, decisionRows(decisions), ['*', '*', 'auto', 'auto', 'auto', 'auto', 'auto']),
      ]
    }),
  ])

  const records: Content[] = view.records.length
    ? [
        table(
          text.recordsHead,
          view.records.map(r => [
            `${names[r.measureId] ?? ''} (← ${names[r.fromMeasureId] ?? ''})`,
            `${r.scenario}, ${percent(r.tolerance)}`,
            year(r.tippingYear, r.horizon),
            year(r.decisionYear, r.horizon),
            r.rationale,
            `${r.decidedByName}, ${new Date(r.decidedAt).toLocaleDateString(dateLocale(language), { dateStyle: 'medium' })}`,
            r.reviewDate,
          ]),
          ['auto', 'auto', 'auto', 'auto', '*', 'auto', 'auto'],
        ),
      ]
    : [{ text: text.recordsNone, color: MUTED }]

  const content: Content[] = [
    { text: text.kind.toUpperCase(), style: 'kicker' },
    { text: text.title(view.site.name), style: 'h1' },
    { text: text.intro, margin: [0, 4, 0, 4] },
    ...(view.scenarios.length ? [] : [{ text: text.noOutlooks, color: CAUTION } as Content]),
    ...pathways,
    { text: text.measuresTitle, style: 'h2', margin: [0, 14, 0, 4], headlineLevel: 1 },
    table(
      text.measuresHead(view.site.referenceLevel),
      view.measures.map(m => [
        m.name,
        m.height === null ? text.noHeight : `${m.height.toFixed(2)} m`,
        m.height === null ? '—' : (text.kinds[m.kind] ?? m.kind),
        text.years(m.leadTimeYears),
        m.designLifeYears === null ? '—' : text.years(m.designLifeYears),
        m.costBand ? (text.costs[m.costBand] ?? m.costBand) : '—',
      ]),
      ['*', 'auto', 'auto', 'auto', 'auto', 'auto'],
    ),
    { text: text.recordsTitle, style: 'h2', margin: [0, 14, 0, 4], headlineLevel: 1 },
    ...records,
    { text: text.method, margin: [0, 10, 0, 2], fontSize: 9 },
    ...view.scenarios.map(
      s =>
        ({
          text: text.basis(s.scenario, s.inputHash, s.releases.map(r => `${r.component} v${r.version}`).join(', ')),
          fontSize: 8,
          color: MUTED,
        }) as Content,
    ),
    {
      stack: [
        { text: text.cautionsTitle, style: 'h2', margin: [0, 14, 0, 4] },
        { ul: text.cautions, color: CAUTION },
      ],
      unbreakable: true,
    },
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
