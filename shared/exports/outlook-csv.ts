import type { OutlookResult } from '../engine'
import { toCsv } from '../releases/csv'

// An outlook as a CSV file for engineers: header rows that say what the numbers are (site, scenario,
// datum, reference epoch, releases, input hash), then the rise by year and percentile, then each
// threshold's chance by year. Rises are metres above mean sea level at the reference epoch, rounded
// to the millimetre; threshold heights are metres above the site's datum, as the planner entered
// them. Every cell goes through csvCell, so text a spreadsheet would run as a formula is quoted.

export interface OutlookCsvMeta {
  siteName: string
  scenario: string
  datum: { name: string, kind: string, offset: number, referenceEpoch: number }
  samples: number
  seed: number
  engineVersion: string
  inputHash: string
  finishedAt: string | null
  releases: { component: string, version: number, citation: string, scale: number }[]
  /** Threshold labels by the result's threshold keys. */
  labels: Record<string, string>
}

/** Metres to the millimetre, written without float noise ("0.123", "-0.005"). */
export const millimetres = (metres: number) => (Math.round(metres * 1000) / 1000).toFixed(3)
/** A chance as a proportion, to four decimals (0.01 % steps). */
const proportion = (p: number) => p.toFixed(4)

export function outlookCsv(meta: OutlookCsvMeta, result: OutlookResult): string {
  const offset = meta.datum.offset
  const rows: (string | number)[][] = [
    ['Brinkwater outlook', 'Illustrative projections, not predictions; see the cautions in a briefing.'],
    ['site', meta.siteName],
    ['scenario', meta.scenario],
    ['datum', meta.datum.name],
    ['datum kind', meta.datum.kind],
    ['mean sea level at the reference epoch above the datum (m)', millimetres(offset)],
    ['reference epoch', meta.datum.referenceEpoch],
    [
      'rise',
      'metres above mean sea level at the reference epoch; add the datum offset above for heights above the datum',
    ],
    ['samples', meta.samples],
    ['seed', meta.seed],
    ['engine version', meta.engineVersion],
    ['input hash', meta.inputHash],
    ['computed', meta.finishedAt ?? ''],
    ...meta.releases.map(r => [`release ${r.component}`, `v${r.version}`, `scale ${r.scale}`, r.citation]),
    [],
    ['year', 'mean (m)', ...result.percentileLevels.map(level => `p${Math.round(level * 100)} (m)`)],
    ...result.byYear.map(y => [
      y.year,
      millimetres(y.mean.value),
      ...result.percentileLevels.map(level =>
        millimetres(y.percentiles.find(p => Math.abs(p.level - level) < 1e-9)!.value),
      ),
    ]),
    [],
    ['threshold', 'kind', 'height above the datum (m)', 'year', 'chance (0-1)', 'standard error', 'measure'],
    ...result.thresholds.flatMap(t =>
      result.years.flatMap((year, i) => {
        const estimate = t.kind === 'flood-level' ? t.flood?.annualChance[i] : t.byYear[i]
        if (!estimate) return []
        const measure
          = t.kind === 'flood-level'
            ? 'chance the annual maximum water level reaches the height that year'
            : 'chance mean sea level is above the height'
        return [
          [
            meta.labels[t.key] ?? t.key,
            t.kind,
            millimetres(t.height + offset),
            year,
            proportion(estimate.value),
            proportion(estimate.se),
            measure,
          ],
        ]
      }),
    ),
  ]
  return toCsv(rows)
}
