import { LANGUAGES } from '../../locales'
import { languageTag, translator, wordsAt, type Language } from '../wording/translate'

// The fixed words of a briefing document, in each language a briefing can be issued in. The page
// and the PDF both read them from here, so the two always say the same thing; the words themselves
// are in locales/<language>/document.json.

/** One chance, said as the number and the calibrated word; in Spanish also after "de" and "a". */
export interface ChanceSaid { plain: string, afterDe: string, afterA: string }
export interface ScenarioChance { scenario: string, chance: ChanceSaid }

export interface BriefingText {
  documentKind: string
  sections: {
    summary: string
    charts: string
    table: string
    basis: string
    cautions: string
    provenance: string
    context: string
  }
  summaryIntro: (site: string, scenario: string) => string
  rangeSentence: (year: number, median: string, low: string, high: string, epoch: number) => string
  /** The summary's findings, one sentence each: the key threshold, its trigger year, the spread over scenarios. */
  keyThreshold: (
    scenario: string,
    site: string,
    threshold: string,
    height: string,
    chances: { chance: ChanceSaid, year: number }[],
  ) => string
  keyFlood: (scenario: string, threshold: string, sentence: string) => string
  trigger: (threshold: string, tolerance: string, year: number) => string
  noTrigger: (threshold: string, tolerance: string, lastYear: number) => string
  spread: (count: number, year: number, low: ScenarioChance, high: ScenarioChance) => string
  spreadSame: (count: number, year: number, chance: ChanceSaid) => string
  gridCaption: (scenario: string, withFlood: boolean) => string
  gridThreshold: string
  /** For the engineer: one sentence per mean-sea-level threshold, every chosen year in it. */
  detailTitle: string
  detailLine: (threshold: string, height: string, chances: { chance: ChanceSaid, year: number }[]) => string
  heights: (unit: string, datum: string) => string
  unitNames: Record<string, string>
  issuedBy: (organisation: string, author: string | null) => string
  /** A flood level's line starts with its name and height; the sentence comes from wording/flood. */
  floodLine: (threshold: string, height: string, sentence: string) => string
  datum: (name: string, kind: string, offset: string, epoch: number) => string
  datumKinds: Record<string, string>
  measures: { meanSeaLevel: string, flood: string }
  chartExceedance: string
  chartExceedanceAxis: { x: string, y: string }
  chartFan: string
  chartFanLegend: { median: string, likely: string, veryLikely: string, extreme: string }
  tableHead: { scenario: string, threshold: string, measure: string }
  extremesTitle: string
  extremesHead: { year: string, allowance: string, expected: (today: number) => string, chance: string }
  extremesNote: string
  storylines: {
    title: string
    intro: string
    line: (level: string, reference: string, year: number, rise: string, epoch: number, p95: string) => string
    source: (organisation: string, version: number, citation: string) => string
    illustrative: string
  }
  /** Beside an allowance that a heavy-tailed release leaves unbounded. */
  unsettled: string
  basisHead: { component: string, scenario: string, version: string, citation: string, state: string, scale: string }
  landMotion: (rate: string, sigma: string, source: string, epoch: number, reference: string) => string
  landMotionDraws: (
    draws: { count: string, median: string, p5: string, p95: string },
    source: string,
    epoch: number,
    reference: string,
  ) => string
  landMotionJoint: (component: string, title: string, version: number) => string
  landMotionIndependent: string
  sampling: (samples: string, seed: number) => string
  method: string[]
  cautions: string[]
  highEnd: string
  provenance: {
    issued: string
    version: string
    inputHash: string
    link: string
    audience: string
    previous: string
    organisation: string
    author: string
    signIn: (organisation: string) => string
  }
  draftMark: string
  illustrative: string
  page: (current: number, total: number) => string
  notes: {
    unscaled: (scenario: string, components: string) => string
    correlated: (scenario: string) => string
    uncorrelated: (scenario: string) => string
  }
  components: Record<string, string>
  states: Record<string, string>
  sources: Record<string, string>
}

/** One language's briefing words, from locales/<language>/document.json (document.*). */
function briefingText(language: Language): BriefingText {
  const t = translator(language)
  const words = <T>(key: string) => wordsAt<T>(language, `document.${key}`)
  const list = (items: string[]) => new Intl.ListFormat(languageTag(language)).format(items)
  const byYear = (chances: { chance: ChanceSaid, year: number }[]) =>
    list(chances.map(c => t('document.chanceByYear', { ...c.chance, year: c.year })))
  return {
    documentKind: t('document.documentKind'),
    sections: words('sections'),
    summaryIntro: (site, scenario) => t('document.summaryIntro', { site, scenario }),
    rangeSentence: (year, median, low, high, epoch) => t('document.rangeSentence', { year, median, low, high, epoch }),
    keyThreshold: (scenario, site, threshold, height, chances) =>
      t('document.keyThreshold', { scenario, site, threshold, height, chances: byYear(chances) }),
    keyFlood: (scenario, threshold, sentence) => t('document.keyFlood', { scenario, threshold, sentence }),
    trigger: (threshold, tolerance, year) => t('document.trigger', { threshold, tolerance, year }),
    noTrigger: (threshold, tolerance, lastYear) => t('document.noTrigger', { threshold, tolerance, lastYear }),
    spread: (count, year, low, high) =>
      t('document.spread', {
        count,
        year,
        lowScenario: low.scenario,
        highScenario: high.scenario,
        low: low.chance.plain,
        lowAfterDe: low.chance.afterDe,
        lowAfterA: low.chance.afterA,
        high: high.chance.plain,
        highAfterDe: high.chance.afterDe,
        highAfterA: high.chance.afterA,
      }),
    spreadSame: (count, year, chance) => t('document.spreadSame', { count, year, ...chance }),
    gridCaption: (scenario, withFlood) =>
      t(withFlood ? 'document.gridCaptionFlood' : 'document.gridCaption', { scenario }),
    gridThreshold: t('document.gridThreshold'),
    detailTitle: t('document.detailTitle'),
    detailLine: (threshold, height, chances) =>
      t('document.detailLine', { threshold, height, chances: byYear(chances) }),
    heights: (unit, datum) => t('document.heights', { unit, datum }),
    unitNames: words('unitNames'),
    issuedBy: (organisation, author) =>
      author ? t('document.issuedByAuthor', { organisation, author }) : t('document.issuedBy', { organisation }),
    floodLine: (threshold, height, sentence) => t('document.floodLine', { threshold, height, sentence }),
    datum: (name, kind, offset, epoch) => t('document.datum', { name, kind, offset, epoch }),
    datumKinds: words('datumKinds'),
    measures: words('measures'),
    chartExceedance: t('document.chartExceedance'),
    chartExceedanceAxis: words('chartExceedanceAxis'),
    chartFan: t('document.chartFan'),
    chartFanLegend: words('chartFanLegend'),
    tableHead: words('tableHead'),
    extremesTitle: t('document.extremesTitle'),
    storylines: {
      ...words<BriefingText['storylines']>('storylines'),
      line: (level, reference, year, rise, epoch, p95) =>
        t('document.storylines.line', { level, reference, year, rise, epoch, p95 }),
      source: (organisation, version, citation) => t('document.storylines.source', { organisation, version, citation }),
    },
    extremesHead: {
      ...words<BriefingText['extremesHead']>('extremesHead'),
      expected: today => t('document.extremesHead.expected', { today }),
    },
    extremesNote: t('document.extremesNote'),
    unsettled: t('document.unsettled'),
    basisHead: words('basisHead'),
    landMotion: (rate, sigma, source, epoch, reference) =>
      t('document.landMotion', { rate, sigma, source, epoch, reference }),
    landMotionDraws: (draws, source, epoch, reference) =>
      t('document.landMotionDraws', { ...draws, source, epoch, reference }),
    landMotionJoint: (component, title, version) => t('document.landMotionJoint', { component, title, version }),
    landMotionIndependent: t('document.landMotionIndependent'),
    sampling: (samples, seed) => t('document.sampling', { samples, seed }),
    method: t.list('document.method'),
    cautions: t.list('document.cautions'),
    highEnd: t('document.highEnd'),
    provenance: {
      ...words<BriefingText['provenance']>('provenance'),
      signIn: organisation =>
        organisation ? t('document.provenance.signInWith', { organisation }) : t('document.provenance.signIn'),
    },
    draftMark: t('document.draftMark'),
    illustrative: t('document.illustrative'),
    page: (current, total) => t('document.page', { current, total }),
    notes: {
      unscaled: (scenario, components) => t('document.notes.unscaled', { scenario, components }),
      correlated: scenario => t('document.notes.correlated', { scenario }),
      uncorrelated: scenario => t('document.notes.uncorrelated', { scenario }),
    },
    components: words('components'),
    states: words('states'),
    sources: words('sources'),
  }
}

export const BRIEFING_TEXT = Object.fromEntries(
  LANGUAGES.map(entry => [entry.code, briefingText(entry.code)]),
) as Record<Language, BriefingText>
