import { LANGUAGES } from '../../locales'
import { translator, wordsAt, type Language } from '../wording/translate'

// Fixed words of the pathways PDF and its chart, from locales/<language>/document.json
// (pathwaysDocument.*); the page uses locales/<language>/pathways.json.

export interface PathwayText {
  kind: string
  title: (site: string) => string
  illustrative: string
  intro: string
  tolerance: (percent: string) => string
  spreadBetween: (measure: string, from: number, fromScenario: string, to: number, toScenario: string) => string
  spreadSingle: (measure: string, year: number, scenario: string) => string
  spreadNone: (measure: string) => string
  notWithin: (scenarios: string, horizon: number) => string
  alreadyLate: string
  afterHorizon: (horizon: number) => string
  years: (n: number) => string
  tableHead: string[]
  measuresTitle: string
  measuresHead: (datum: string) => string[]
  noHeight: string
  kinds: Record<string, string>
  costs: Record<string, string>
  recordsTitle: string
  recordsNone: string
  recordsHead: string[]
  basis: (scenario: string, hash: string, releases: string) => string
  restsOn: (hash: string, releases: string, engine: string) => string
  /** A briefing's pathways section: its title, and whether it is frozen (issued) or follows the site (draft). */
  briefing: {
    title: string
    frozen: (date: string, year: number) => string
    live: string
    chartAlt: (title: string) => string
  }
  method: string
  cautionsTitle: string
  cautions: string[]
  chart: { today: string, late: string, decision: string, beyond: string }
  noOutlooks: string
  page: (page: number, pages: number) => string
}

/** One language's pathways words, from locales/<language>/document.json (pathwaysDocument.*). */
function pathwayText(language: Language): PathwayText {
  const t = translator(language)
  const say = (key: string) => t(`pathwaysDocument.${key}`)
  const words = <T>(key: string) => wordsAt<T>(language, `pathwaysDocument.${key}`)
  return {
    kind: say('kind'),
    title: site => t('pathwaysDocument.title', { site }),
    illustrative: say('illustrative'),
    intro: say('intro'),
    tolerance: percent => t('pathwaysDocument.tolerance', { percent }),
    spreadBetween: (measure, from, fromScenario, to, toScenario) =>
      t('pathwaysDocument.spreadBetween', { measure, from, fromScenario, to, toScenario }),
    spreadSingle: (measure, year, scenario) => t('pathwaysDocument.spreadSingle', { measure, year, scenario }),
    spreadNone: measure => t('pathwaysDocument.spreadNone', { measure }),
    notWithin: (scenarios, horizon) => t('pathwaysDocument.notWithin', { scenarios, horizon }),
    alreadyLate: say('alreadyLate'),
    afterHorizon: horizon => t('pathwaysDocument.afterHorizon', { horizon }),
    years: n => t('pathwaysDocument.years', { n }),
    tableHead: t.list('pathwaysDocument.tableHead'),
    measuresTitle: say('measuresTitle'),
    measuresHead: datum => t.list('pathwaysDocument.measuresHead', { datum }),
    noHeight: say('noHeight'),
    kinds: words('kinds'),
    costs: words('costs'),
    recordsTitle: say('recordsTitle'),
    recordsNone: say('recordsNone'),
    recordsHead: t.list('pathwaysDocument.recordsHead'),
    basis: (scenario, hash, releases) => t('pathwaysDocument.basis', { scenario, hash, releases }),
    restsOn: (hash, releases, engine) => t('pathwaysDocument.restsOn', { hash, releases, engine }),
    briefing: {
      title: say('briefing.title'),
      frozen: (date, year) => t('pathwaysDocument.briefing.frozen', { date, year }),
      live: say('briefing.live'),
      chartAlt: title => t('pathwaysDocument.briefing.chartAlt', { title }),
    },
    method: say('method'),
    cautionsTitle: say('cautionsTitle'),
    cautions: t.list('pathwaysDocument.cautions'),
    chart: words('chart'),
    noOutlooks: say('noOutlooks'),
    page: (page, pages) => t('pathwaysDocument.page', { page, pages }),
  }
}

export const PATHWAY_TEXT = Object.fromEntries(LANGUAGES.map(entry => [entry.code, pathwayText(entry.code)])) as Record<
  Language,
  PathwayText
>
