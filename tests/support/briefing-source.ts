import type { BriefingSource } from '../../shared/briefing/document'
import type { OutlookResult } from '../../shared/engine'

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
