import type { OutlookResult, ThresholdOutlook } from '../engine'
import { formatHeight, type HeightUnit } from '../units'
import { EXTRAPOLATED_MARK, extrapolatedNote, formatChance, type Language } from '../wording/chance'
import {
  amplificationReturnPeriod,
  designLifeLevelSentence,
  floodYearSentence,
  lifeSentence,
  todaysLevelExpected,
} from '../wording/flood'
import type { DatumKind, ThresholdKind } from '../types/science'
import type { OutlookLandDraws } from '../types/outlook'
import { BRIEFING_TEXT, type BriefingText } from './text'
import { headlineEstimate, keyThreshold, sayChance, spreadSentence } from './findings'
import { observationUpdateSection, type BriefingObservationUpdate } from './observation-update'
import type { BriefingPathwaySection } from './pathway-section'

// A briefing as a document: every sentence and number, in one language and one unit, built from
// stored outlooks. Issuing freezes this object; the page and the PDF only lay it out.

export interface BriefingReleaseRef {
  component: string
  version: number
  citation: string
  state: string
  scale: number
  scaleSource: string | null
}
export interface BriefingOutlook {
  scenario: string
  inputHash: string
  samples: number
  seed: number
  /** Whether a published correlation set tied the components together. */
  correlated: boolean
  releaseRefs: BriefingReleaseRef[]
  result: OutlookResult
}

/**
 * A published high-end storyline placed at the site (see shared/storylines/rise.ts): beside the chances, never in them.
 */
export interface BriefingStoryline {
  name: string
  description: string
  version: number
  citation: string
  organisationName: string
  illustrative: boolean
  /** Metres above mean sea level at the reference epoch. */
  rises: { year: number, rise: number }[]
}

export interface BriefingSource {
  language: Language
  units: HeightUnit
  title: string
  audience: string
  localContext: string
  version: number
  previousVersion: number | null
  issuedAt: string | null
  livePath: string
  illustrative: boolean
  /** The organisation that issues the briefing, and the person who issued (or, for a draft, drafted) it. */
  organisation: string
  author: string | null
  /** The chance a planner plans to, for the trigger year; the outlook page's 10 % when none is chosen. */
  tolerance?: number
  site: {
    name: string
    referenceLevel: string
    landMotionRate: number
    landMotionSigma: number
    landMotionSource: string
    landMotionReference: string
    landMotionEpoch: number
    /** The primary outlook's land-motion draws, when its land motion came from draws. */
    landMotionDraws?: OutlookLandDraws
    datumKind: DatumKind
    /** Mean sea level at the reference epoch, metres above the datum. */
    datumOffset: number
    referenceEpoch: number
  }
  /** Heights above the datum, as the planner entered them. */
  thresholds: { id: string, label: string, height: number, kind: ThresholdKind }[]
  years: number[]
  /** The first is the outlook the briefing is issued from; the others are compared with it. */
  outlooks: BriefingOutlook[]
  /** The primary outlook's scenario's published storylines, if any. */
  storylines?: BriefingStoryline[]
}

/** A chance in the table; `extrapolated` (and * in `text`) where it rests on a release beyond its outermost level. */
export interface ChanceCell { probability: number, text: string, extrapolated?: boolean }

/** Thresholds × years under the briefing's own scenario: the summary's compact table. */
export interface SummaryGrid {
  scenario: string
  caption: string
  years: number[]
  rows: { threshold: string, height: string, flood: boolean, chances: ChanceCell[] }[]
}

export interface BriefingDocument {
  /** organisation, author and heights are absent from briefings issued before they were stated. */
  meta: Omit<BriefingSource, 'outlooks' | 'thresholds' | 'years' | 'site' | 'organisation' | 'author' | 'tolerance'> & {
    siteName: string
    referenceLevel: string
    scenario: string
    inputs: { scenario: string, inputHash: string }[]
    organisation?: string
    author?: string | null
    heights?: string
  }
  /**
   * What a councillor reads first: two or three findings, one sentence each, and the compact table.
   * Briefings issued before had one line per threshold and year (`lines`) and `ranges` here instead.
   */
  summary: { intro: string, findings?: string[], grid?: SummaryGrid, lines?: string[], ranges?: string[] }
  /** For the engineer, after the table of chances: each threshold in one sentence, then the ranges. */
  detail?: { lines: string[], ranges: string[] }
  /** High-end storylines, each with a line per chosen year it reaches (absent in documents issued before). */
  storylines?: { name: string, description: string, lines: string[], source: string }[]
  charts: {
    years: number[]
    heights: number[]
    exceedance: { year: number, values: number[] }[]
    fan: {
      years: number[]
      p1: number[]
      p5: number[]
      p17: number[]
      p50: number[]
      p83: number[]
      p95: number[]
      p99: number[]
      /** Per year: the 1 % or 99 % level is extrapolated. */ outerExtrapolated?: boolean[]
    }
  }
  /** The site's pathways and decision records, when the planner chose them (shared/briefing/pathway-section.ts). */
  pathways?: BriefingPathwaySection
  /** What * means, where any number of the document is extrapolated (absent in documents issued before). */
  extrapolation?: string | null
  table: {
    years: number[]
    rows: { scenario: string, threshold: string, height: string, measure: string, chances: ChanceCell[] }[]
  }
  /**
   * Allowance and amplification by year; amplification worded as expected floods of today's `today`-year level, with
   * its annual chance.
   */
  extremes: { today: number, rows: { year: number, allowance: string, expected: string, chance: string }[] } | null
  basis: {
    releases: { component: string, scenario: string, version: number, citation: string, state: string, scale: string }[]
    datum: string
    landMotion: string
    sampling: string
    notes: string[]
    method: string[]
  }
  cautions: string[]
  /**
   * The briefing's outlook updated by the site's gauge record, with method, assumptions and limits;
   * absent when it was not weighted by one (and in documents issued before).
   */
  observationUpdate?: BriefingObservationUpdate
}

/** The outlook page's tolerance for a trigger year, used when the briefing's source names none. */
export const DEFAULT_TOLERANCE = 0.1

/** What a reader should know about how an outlook was put together, in the briefing's language. */
function outlookNotes(outlook: BriefingOutlook, text: BriefingText): string[] {
  const unscaled = outlook.releaseRefs
    .filter(ref => ref.scaleSource === null)
    .map(ref => text.components[ref.component] ?? ref.component)
  return [
    ...(unscaled.length ? [text.notes.unscaled(outlook.scenario, unscaled.join(', '))] : []),
    outlook.correlated ? text.notes.correlated(outlook.scenario) : text.notes.uncorrelated(outlook.scenario),
  ]
}

function percentile(result: OutlookResult, yearIndex: number, level: number): number {
  return result.byYear[yearIndex]!.percentiles.find(p => Math.abs(p.level - level) < 1e-9)!.value
}

/** Heights worth drawing: where some chosen year's chance is between 0.1 % and 99.9 %, with a margin. */
function chartHeights(result: OutlookResult, yearIndexes: number[]) {
  let first = result.heights.length - 1
  let last = 0
  for (const t of yearIndexes) {
    result.byYear[t]!.exceedance.forEach((e, h) => {
      if (e.value < 0.999 && e.value > 0.001) {
        first = Math.min(first, h)
        last = Math.max(last, h)
      }
    })
  }
  if (first > last) return { from: 0, to: result.heights.length - 1 }
  return { from: Math.max(0, first - 3), to: Math.min(result.heights.length - 1, last + 3) }
}

function summaryGrid(rows: BriefingDocument['table']['rows'], source: BriefingSource, text: BriefingText): SummaryGrid {
  const flood = (row: { measure: string }) => row.measure === text.measures.flood
  return {
    scenario: source.outlooks[0]!.scenario,
    caption: text.gridCaption(source.outlooks[0]!.scenario, rows.some(flood)),
    years: source.years,
    rows: rows.map(row => ({ threshold: row.threshold, height: row.height, flood: flood(row), chances: row.chances })),
  }
}

/** Briefings issued before amplification was worded as expected floods froze this shape. */
interface FrozenMultipleRow { year: number, allowance: string, amplification: string }
const FROZEN_MULTIPLE_HEAD: Record<Language, string> = {
  en: 'Floods more often (×)',
  es: 'Inundaciones más frecuentes (×)',
}

/** The allowance table as laid out on the page and in the PDF, for a new or an already issued document. */
export function extremesTable(
  doc: Pick<BriefingDocument, 'extremes' | 'meta'>,
): { head: string[], rows: string[][] } | null {
  const extremes = doc.extremes as BriefingDocument['extremes'] | FrozenMultipleRow[]
  if (!extremes) return null
  const text = BRIEFING_TEXT[doc.meta.language]
  if (Array.isArray(extremes)) {
    return {
      head: [text.extremesHead.year, text.extremesHead.allowance, FROZEN_MULTIPLE_HEAD[doc.meta.language]],
      rows: extremes.map(row => [String(row.year), row.allowance, row.amplification]),
    }
  }
  return {
    head: [
      text.extremesHead.year,
      text.extremesHead.allowance,
      text.extremesHead.expected(extremes.today),
      text.extremesHead.chance,
    ],
    rows: extremes.rows.map(row => [String(row.year), row.allowance, row.expected, row.chance]),
  }
}

export function buildBriefingDocument(source: BriefingSource): BriefingDocument {
  const text = BRIEFING_TEXT[source.language]
  const height = (metres: number) => formatHeight(metres, source.units, source.language)
  const [primary] = source.outlooks
  if (!primary) throw new Error('A briefing needs at least one outlook')
  const result = primary.result
  const yearIndexes = source.years.map((year) => {
    const index = result.years.indexOf(year)
    if (index < 0) throw new Error(`Year ${year} is not in the outlook`)
    return index
  })
  const thresholdOf = (outlook: BriefingOutlook, id: string) => outlook.result.thresholds.find(t => t.key === id)

  const site = source.site
  const floodContext = { datum: site.referenceLevel, unit: source.units, language: source.language }
  // The engine's heights are above mean sea level at the epoch; the planner's above the datum.
  const aboveDatum = (metres: number) => metres + site.datumOffset
  const isFlood = (threshold: { kind?: ThresholdKind }) => threshold.kind === 'flood-level'
  // The height the outlook was computed with, which the site's current one may have moved from since.
  const heightOf = (threshold: BriefingSource['thresholds'][number], found: ReturnType<typeof thresholdOf>) =>
    height(found ? aboveDatum(found.height) : threshold.height)

  const language = source.language
  const floodLines = (threshold: BriefingSource['thresholds'][number], found: ThresholdOutlook) => {
    const flood = found.flood!
    // Every line names its level: a briefing may list several.
    const named = (sentence: string) => text.floodLine(threshold.label, heightOf(threshold, found), sentence)
    const years = yearIndexes.map(t =>
      named(
        floodYearSentence(
          {
            year: result.years[t]!,
            height: aboveDatum(found.height),
            annualChance: flood.annualChance[t]!.value,
            expectedPerYear: flood.expectedPerYear[t]!,
          },
          floodContext,
        ),
      ),
    )
    const life
      = found.lifeExceedance && found.designLifeYears && found.lifeStartYear
        ? [
            named(
              lifeSentence(
                {
                  buildYear: found.lifeStartYear,
                  lifeYears: found.designLifeYears,
                  chance: found.lifeExceedance.value,
                },
                language,
              ),
            ),
          ]
        : []
    const level = found.designLifeLevel
      ? [
          named(
            designLifeLevelSentence(
              { chance: found.designLifeLevel.chance, level: aboveDatum(found.designLifeLevel.level) },
              floodContext,
            ),
          ),
        ]
      : []
    return [...years, ...life, ...level]
  }
  const detailLines = source.thresholds.flatMap((threshold) => {
    const found = thresholdOf(primary, threshold.id)
    if (isFlood(threshold)) return found?.flood ? floodLines(threshold, found) : []
    const chances = yearIndexes.map(t => ({
      chance: sayChance(found?.byYear[t] ?? { value: 0 }, language),
      year: result.years[t]!,
    }))
    return [text.detailLine(threshold.label, heightOf(threshold, found), chances)]
  })
  const ranges = yearIndexes.map(t =>
    text.rangeSentence(
      result.years[t]!,
      height(percentile(result, t, 0.5)),
      height(percentile(result, t, 0.17)),
      height(percentile(result, t, 0.83)),
      site.referenceEpoch,
    ),
  )

  // The findings: the key threshold by the last chosen year, its trigger year, the spread over scenarios.
  const last = yearIndexes.reduce((a, b) => (result.years[b]! > result.years[a]! ? b : a))
  const lastYear = result.years[last]!
  const key = keyThreshold(source.thresholds, id => thresholdOf(primary, id))
  const findings: string[] = []
  if (key) {
    const found = thresholdOf(primary, key.id)!
    if (isFlood(key)) {
      findings.push(
        text.keyFlood(
          primary.scenario,
          key.label,
          floodYearSentence(
            {
              year: lastYear,
              height: aboveDatum(found.height),
              annualChance: found.flood!.annualChance[last]!.value,
              expectedPerYear: found.flood!.expectedPerYear[last]!,
            },
            floodContext,
          ),
        ),
      )
    }
    else {
      // From the first chosen year to the last: how the chance grows, in one sentence.
      const first = yearIndexes.reduce((a, b) => (result.years[b]! < result.years[a]! ? b : a))
      const ends = (first === last ? [last] : [first, last]).map(t => ({
        chance: sayChance(found.byYear[t]!, language),
        year: result.years[t]!,
      }))
      findings.push(text.keyThreshold(primary.scenario, site.name, key.label, heightOf(key, found), ends))
      const tolerance = source.tolerance ?? DEFAULT_TOLERANCE
      const trigger = found.triggerYears.find(tr => Math.abs(tr.tolerance - tolerance) < 1e-9)
      if (trigger) {
        const said = formatChance(tolerance, language)
        findings.push(
          trigger.year === null
            ? text.noTrigger(key.label, said, result.years.at(-1)!)
            : text.trigger(key.label, said, trigger.year),
        )
      }
    }
    const chances = source.outlooks.flatMap((outlook) => {
      const estimate = headlineEstimate(thresholdOf(outlook, key.id), outlook.result.years.indexOf(lastYear))
      return estimate ? [{ scenario: outlook.scenario, estimate }] : []
    })
    const spread = spreadSentence(chances, lastYear, text, language)
    if (spread) findings.push(spread)
  }
  // With one scenario (or nothing to compare), the likely range by the last year stands in for the spread.
  if (findings.length < 3) findings.push(ranges[yearIndexes.indexOf(last)]!)

  const { from, to } = chartHeights(result, yearIndexes)
  const series = (level: number) => result.byYear.map((_, t) => percentile(result, t, level))

  const rows = source.outlooks.flatMap(outlook => source.thresholds.map((threshold) => {
    const found = thresholdOf(outlook, threshold.id)
    const chanceAt = (index: number) => {
      if (index < 0 || !found) return Number.NaN
      if (isFlood(threshold)) return found.flood?.annualChance[index]?.value ?? Number.NaN
      return found.byYear[index]?.value ?? Number.NaN
    }
    const extrapolatedAt = (index: number) => !isFlood(threshold) && found?.byYear[index]?.extrapolated === true
    return {
      scenario: outlook.scenario,
      threshold: threshold.label,
      height: heightOf(threshold, found),
      measure: isFlood(threshold) ? text.measures.flood : text.measures.meanSeaLevel,
      chances: source.years.map((year): ChanceCell => {
        const index = outlook.result.years.indexOf(year)
        const p = chanceAt(index)
        if (Number.isNaN(p)) return { probability: p, text: '—' }
        return extrapolatedAt(index)
          ? { probability: p, text: `${formatChance(p, source.language)} ${EXTRAPOLATED_MARK}`, extrapolated: true }
          : { probability: p, text: formatChance(p, source.language) }
      }),
    }
  }))

  const outerExtrapolated = result.byYear.map(y =>
    y.percentiles.some(
      p => p.extrapolated === true && (Math.abs(p.level - 0.01) < 1e-9 || Math.abs(p.level - 0.99) < 1e-9),
    ),
  )
  const anyExtrapolated
    = outerExtrapolated.some(Boolean)
      || rows.some(row => row.chances.some(cell => cell.extrapolated))
      || source.thresholds.some(
        threshold =>
          !isFlood(threshold)
          && yearIndexes.some(t => thresholdOf(primary, threshold.id)?.byYear[t]?.extrapolated === true),
      )
  const storylines = (source.storylines ?? []).map(storyline => ({
    // Demo storylines are labelled illustrative, once.
    name:
      storyline.illustrative && !/illustrative|ilustrativ/i.test(storyline.name)
        ? `${storyline.name} (${text.storylines.illustrative})`
        : storyline.name,
    description: storyline.description,
    lines: yearIndexes.flatMap((t) => {
      const year = result.years[t]!
      const at = storyline.rises.find(r => r.year === year)
      return at
        ? [
            text.storylines.line(
              height(aboveDatum(at.rise)),
              site.referenceLevel,
              year,
              height(at.rise),
              site.referenceEpoch,
              height(percentile(result, t, 0.95)),
            ),
          ]
        : []
    }),
    source: text.storylines.source(storyline.organisationName, storyline.version, storyline.citation),
  }))
  const wordedPeriod = result.gumbel
    ? amplificationReturnPeriod(result.byYear[yearIndexes[0] ?? 0]!.gumbel!.returnPeriods)
    : undefined
  const extremes = wordedPeriod
    ? {
        today: wordedPeriod.today,
        rows: yearIndexes.map((t) => {
          const g = result.byYear[t]!.gumbel!
          const period = g.returnPeriods.find(r => r.today === wordedPeriod.today)!
          // A heavy-tailed release makes both unbounded: the figures are for its tail capped, and say so.
          const capped = g.settled === false ? ` (${text.unsettled})` : ''
          return {
            year: result.years[t]!,
            allowance: `${height(g.allowance)}${capped}`,
            expected: `${todaysLevelExpected({ today: period.today, amplification: g.amplification }, source.language)}${capped}`,
            chance: formatChance(period.annualChance.value, source.language),
          }
        }),
      }
    : null

  return {
    meta: {
      language: source.language,
      units: source.units,
      title: source.title,
      audience: source.audience,
      localContext: source.localContext,
      version: source.version,
      previousVersion: source.previousVersion,
      issuedAt: source.issuedAt,
      livePath: source.livePath,
      illustrative: source.illustrative,
      siteName: site.name,
      referenceLevel: site.referenceLevel,
      scenario: primary.scenario,
      inputs: source.outlooks.map(o => ({ scenario: o.scenario, inputHash: o.inputHash })),
      organisation: source.organisation,
      author: source.author,
      heights: text.heights(text.unitNames[source.units] ?? source.units, site.referenceLevel),
    },
    summary: {
      intro: text.summaryIntro(site.name, primary.scenario),
      findings,
      grid: summaryGrid(
        rows.filter(row => row.scenario === primary.scenario),
        source,
        text,
      ),
    },
    detail: { lines: detailLines, ranges },
    storylines,
    charts: {
      years: result.years,
      heights: result.heights.slice(from, to + 1),
      exceedance: yearIndexes.map(t => ({
        year: result.years[t]!,
        values: result.byYear[t]!.exceedance.slice(from, to + 1).map(e => e.value),
      })),
      fan: {
        years: result.years,
        p1: series(0.01),
        p5: series(0.05),
        p17: series(0.17),
        p50: series(0.5),
        p83: series(0.83),
        p95: series(0.95),
        p99: series(0.99),
        outerExtrapolated,
      },
    },
    extrapolation: anyExtrapolated ? extrapolatedNote(source.language) : null,
    table: { years: source.years, rows },
    extremes,
    basis: {
      releases: source.outlooks.flatMap(outlook =>
        outlook.releaseRefs.map(ref => ({
          component: text.components[ref.component] ?? ref.component,
          scenario: outlook.scenario,
          version: ref.version,
          citation: ref.citation,
          state: text.states[ref.state] ?? ref.state,
          scale: ref.scale.toLocaleString(source.language, { maximumFractionDigits: 3 }),
        })),
      ),
      datum: text.datum(
        site.referenceLevel,
        text.datumKinds[site.datumKind] ?? site.datumKind,
        height(site.datumOffset),
        site.referenceEpoch,
      ),
      landMotion: landMotionBasis(site, source.language, text),
      sampling: text.sampling(primary.samples.toLocaleString(source.language), primary.seed),
      notes: source.outlooks.flatMap(outlook => outlookNotes(outlook, text)),
      method: text.method,
    },
    cautions: [...text.cautions, text.highEnd],
    ...observed(source, result),
  }
}

/** The land motion the outlooks assumed: the site's rate and sigma, or its draws (and what they were joint with). */
function landMotionBasis(site: BriefingSource['site'], language: Language, text: BriefingText): string {
  const draws = site.landMotionDraws
  if (!draws) {
    return text.landMotion(
      `${site.landMotionRate.toLocaleString(language)} mm`,
      `${site.landMotionSigma.toLocaleString(language)} mm`,
      text.sources[site.landMotionSource] ?? site.landMotionSource,
      site.landMotionEpoch,
      site.landMotionReference,
    )
  }
  const mm = (rate: number) => `${rate.toLocaleString(language, { maximumFractionDigits: 2 })} mm`
  const { summary, joint } = draws
  const sentence = text.landMotionDraws(
    {
      count: summary.count.toLocaleString(language),
      median: mm(summary.median),
      p5: mm(summary.p5),
      p95: mm(summary.p95),
    },
    text.sources[draws.source] ?? draws.source,
    site.landMotionEpoch,
    draws.reference,
  )
  const link = joint
    ? text.landMotionJoint(text.components[joint.component] ?? joint.component, joint.title, joint.version)
    : text.landMotionIndependent
  return `${sentence.trim()} ${link}`
}

function observed(source: BriefingSource, result: OutlookResult) {
  const section = observationUpdateSection(source, result, source.tolerance ?? DEFAULT_TOLERANCE)
  return section ? { observationUpdate: section } : {}
}
