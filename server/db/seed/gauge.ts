import { fitGaugeTrend, NODAL_PERIOD_YEARS } from '../../../shared/observations/gauge-trend'
import type { GaugeValue } from '../../../shared/observations/gauge-record'
import { gaugePoints } from '../../../shared/observations/gauge-record'
import type { Database } from '../client'
import { gaugeRecords } from '../schema'

// An invented annual tide-gauge record for a demo town (illustrative): a steady relative rise, a nodal
// cycle and a deterministic wobble standing in for weather, so the demo shows a fit and tracking.

/** Relative rise `rateMmPerYear` in 2000, quickening by `accelerationMmPerYear2` a year. */
export interface DemoGauge {
  firstYear: number
  lastYear: number
  rateMmPerYear: number
  accelerationMmPerYear2: number
}

function demoValues(gauge: DemoGauge, datumOffset: number): GaugeValue[] {
  const values: GaugeValue[] = []
  for (let year = gauge.firstYear; year <= gauge.lastYear; year++) {
    if (year === 1996 || year === 1997) continue // a gap, as real records have
    const time = year + 0.5
    const wobble = 0.014 * Math.sin(year * 2.39996) + 0.009 * Math.sin(year * 0.91)
    const nodal = 0.007 * Math.sin((2 * Math.PI * time) / NODAL_PERIOD_YEARS)
    // Zero at 2020 on the datum's mean sea level: rate r + a·(t − 2000), integrated from 2020.
    const rise
      = (gauge.rateMmPerYear * (time - 2020) + (gauge.accelerationMmPerYear2 / 2) * ((time - 2000) ** 2 - 400)) / 1000
    const height = datumOffset + rise + nodal + wobble
    values.push({ year, month: null, height: Math.round(height * 1000) / 1000, flag: null })
  }
  return values
}

export async function seedGaugeRecord(
  tx: Pick<Database, 'insert'>,
  siteId: string,
  gauge: DemoGauge,
  datumOffset: number,
) {
  const values = demoValues(gauge, datumOffset)
  const record = { resolution: 'annual' as const, values, gaps: [{ from: '1996', to: '1997', missing: 2 }] }
  await tx
    .insert(gaugeRecords)
    .values({ siteId, version: 1, ...record, fit: fitGaugeTrend(gaugePoints(record), 'annual'), fitIssue: null })
}
