import type { BriefingSource } from '../../shared/briefing/document'
import { runOutlook, type ObservationsInput, type OutlookResult } from '../../shared/engine'

/**
 * The briefing source the document tests word: an invented site (Testport, land sinking 2 ± 0.5 mm/yr),
 * one mean-sea-level threshold at 0.50 m, one SSP2-4.5 outlook of `samples` samples giving `result`, and
 * one glaciers release behind it. Tests override what they are about.
 */
export function testportSource(
  result: OutlookResult,
  samples: number,
  overrides: Partial<BriefingSource> = {},
): BriefingSource {
  return {
    language: 'en',
    units: 'm',
    title: 'Test',
    audience: '',
    localContext: '',
    version: 1,
    previousVersion: null,
    issuedAt: null,
    livePath: '/briefings/x',
    illustrative: false,
    organisation: 'Testport Council',
    author: 'Ada Planner',
    site: {
      name: 'Testport',
      referenceLevel: 'MSL 2020',
      landMotionRate: -2,
      landMotionSigma: 0.5,
      landMotionSource: 'gps',
      landMotionReference: 'Station T',
      landMotionEpoch: 2020,
      datumKind: 'mean-sea-level',
      datumOffset: 0,
      referenceEpoch: 2020,
    },
    thresholds: [{ id: 't1', label: 'Quay', height: 0.5, kind: 'mean-sea-level' }],
    years: [2100],
    outlooks: [
      {
        scenario: 'SSP2-4.5',
        inputHash: 'abc',
        samples,
        seed: 5,
        correlated: false,
        result,
        releaseRefs: [
          { component: 'glaciers', version: 3, citation: 'Cite (2026)', state: 'published', scale: 1, scaleSource: null },
        ],
      },
    ],
    ...overrides,
  }
}

/** A small outlook: rise 0.5 ± 0.1 m by 2100 (normal, linear from 2020), threshold t1 at 0.5 m. */
export function smallOutlook(observations?: ObservationsInput, thresholdHeight = 0.5) {
  return runOutlook({
    baselineYear: 2020,
    years: [2020, 2050, 2100],
    samples: 8192,
    seed: 5,
    components: [
      { key: 'glaciers', scale: 1, release: { form: 'normal', baselineYear: 2020, anchorYears: [2100], mean: [0.5], sd: [0.1] } },
    ],
    heights: { from: 0, to: 1, step: 0.05 },
    thresholds: [{ key: 't1', height: thresholdHeight }],
    ...(observations ? { observations } : {}),
  })
}

/** 25 annual values since 2020 rising at `rate` m/yr, with 1 cm residuals correlated 0.3 year to year. */
export function recordSince2020(rate: number): ObservationsInput {
  const times = Array.from({ length: 25 }, (_, i) => 2020.5 + i)
  return { times, rise: times.map(t => rate * (t - 2020)), residualSd: 0.01, phi: 0.3 }
}
