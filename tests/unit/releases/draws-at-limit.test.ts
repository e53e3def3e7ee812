import { describe, expect, it } from 'vitest'
import { buildRelease } from '../../../shared/releases/content'
import { MAX_UPLOADED_DRAWS } from '../../../shared/releases/limits'
import { previewYears, releaseBands } from '../../../shared/releases/summary'

// A samples release as large as an analyst may upload must build and preview. Spreading its draws
// into a call (Math.max(...draws), push(...draws)) threw a RangeError from about 70,000 draws.
describe('a samples release at the upload limit', () => {
  it(`builds and previews ${MAX_UPLOADED_DRAWS.toLocaleString('en')} draws`, () => {
    const draws = Array.from({ length: MAX_UPLOADED_DRAWS }, (_, i) => [
      0.1 + (i % 1000) / 10_000,
      0.2 + (i % 1000) / 5000,
    ])
    const release = buildRelease({
      form: 'samples',
      unit: 'm',
      baselineYear: 2020,
      anchorYears: [2050, 2100],
      draws,
    } as never)
    const bands = releaseBands(release, previewYears(release))
    // [practice] the draws at 2100 run evenly from 0.2 to 0.3998, so their median is about 0.3.
    expect(bands.at(-1)!.p50).toBeCloseTo(0.3, 2)
  })
})
