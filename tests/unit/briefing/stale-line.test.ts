import { describe, expect, it } from 'vitest'
import { staleLine } from '../../../shared/briefing/stale-line'
import type { StaleFigure } from '../../../shared/types/staleness'

// The e-mail's words for each kind of changed figure: a changed chance, an update no longer given, and an
// update the briefing never had.

const figure = (kind: StaleFigure['kind'], was: number | null, now: number | null): StaleFigure => ({
  scenario: 'SSP2-4.5', thresholdId: 't1', threshold: 'Quay apron', kind, year: 2100, was, now,
})

describe('the briefing-out-of-date e-mail line', () => {
  it('gives both chances when a figure changed', () => {
    // Chances carry a narrow no-break space before the per cent sign (\s matches it).
    expect(staleLine(figure('gauge-updated', 0.04, 0.19), 'en')).toMatch(
      /^SSP2-4\.5, chance mean sea level is above "Quay apron" by 2100 updated by the tide-gauge record: 19\s% now, 4\s% in this briefing\.$/,
    )
  })

  it('says the update is no longer given, and that one is given now where the briefing had none', () => {
    expect(staleLine(figure('gauge-update-gone', 0.04, null), 'en')).toMatch(/: 4\s% in this briefing, no longer given now/)
    const fresh = staleLine(figure('gauge-update-new', null, 0.19), 'en')
    expect(fresh).toMatch(/updated by the tide-gauge record: 19\s% now; this briefing gives no such update/)
    expect(fresh).not.toMatch(/in this briefing\.$/)
    expect(staleLine(figure('gauge-update-new', null, 0.19), 'es')).toMatch(/19\s% ahora; este informe no da esa actualización/)
  })
})
