import { describe, expect, it } from 'vitest'
import {
  chanceOfAtLeastOne,
  EngineInputError,
  fitGumbelByLMoments,
  fitGumbelByMoments,
  gigatonnesToMetres,
  gumbelFromMoments,
  gumbelReturnLevel,
  likelihoodWord,
  metresToGigatonnes,
  runOutlook,
} from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

describe('Gumbel helpers', () => {
  it('fits the worked example by moments', () => {
    // [pub] Cornell CEE 304 course example: mean 2.5, sd 0.7 → location 2.185, scale 0.5458, 50-year 4.315
    const fit = gumbelFromMoments(2.5, 0.7)
    expect(fit.location).toBeCloseTo(2.185, 3)
    expect(fit.scale).toBeCloseTo(0.5458, 4)
    expect(gumbelReturnLevel(fit, 50)).toBeCloseTo(4.315, 2)
  })

  it('uses the T = 100 factor 4.6001', () => {
    // [practice] CHECKS.md: z_T = μ − λ·ln(−ln(1 − 1/T)); the factor for T = 100 is 4.6001
    expect(gumbelReturnLevel({ location: 0, scale: 1 }, 100)).toBeCloseTo(4.6001, 4)
  })

  it('fits a sample by L-moments (Hosking & Wallis) and by moments', () => {
    // [pub] Hosking & Wallis (1997) L-moment estimators, computed by hand for 1, 2, 3, 4, 10:
    // b0 = 4, b1 = (0·1 + ¼·2 + ½·3 + ¾·4 + 1·10)/5 = 3, l2 = 2, λ = 2/ln 2, μ = 4 − 0.5772λ
    const sample = [3, 10, 1, 4, 2]
    const fit = fitGumbelByLMoments(sample)
    expect(fit.scale).toBeCloseTo(2 / Math.LN2, 10)
    expect(fit.location).toBeCloseTo(4 - 0.5772156649 * (2 / Math.LN2), 8)
    // [pub] standard hydrology texts: λ = √6·s/π, μ = x̄ − 0.5772λ, s the sample sd (n − 1)
    const moments = fitGumbelByMoments(sample)
    const s = Math.sqrt(((1 + 4 + 9 + 0 + 36) / 4))
    expect(moments.scale).toBeCloseTo((Math.sqrt(6) * s) / Math.PI, 10)
  })

  it('recovers the parameters from a large Gumbel sample', () => {
    // Inverse-CDF draws z = μ − λ ln(−ln u) at evenly spread u: both fits must land near μ 1.2, λ 0.15.
    const sample = Array.from({ length: 4000 }, (_, i) => 1.2 - 0.15 * Math.log(-Math.log((i + 0.5) / 4000)))
    for (const fit of [fitGumbelByLMoments(sample), fitGumbelByMoments(sample)]) {
      expect(fit.location).toBeCloseTo(1.2, 2)
      expect(fit.scale).toBeCloseTo(0.15, 2)
    }
  })

  it('gives the chance of at least one 100-year event in 30, 50 and 100 years', () => {
    // [practice] CHECKS.md flood frequency: 26.0 %, 39.5 %, 63.4 %
    expect(chanceOfAtLeastOne(100, 30)).toBeCloseTo(0.26, 3)
    expect(chanceOfAtLeastOne(100, 50)).toBeCloseTo(0.395, 3)
    expect(chanceOfAtLeastOne(100, 100)).toBeCloseTo(0.634, 3)
  })

  it('refuses unusable fits with a typed error', () => {
    expect(() => fitGumbelByLMoments([1])).toThrow(EngineInputError)
    expect(() => fitGumbelByLMoments([2, 2, 2])).toThrow(/spread/)
    expect(() => fitGumbelByMoments([1, Number.NaN])).toThrow(/annualMaxima\[1\]/)
    expect(() => gumbelReturnLevel({ location: 0, scale: 0 }, 100)).toThrow(/scale/)
    expect(() => chanceOfAtLeastOne(0.5, 10)).toThrow(EngineInputError)
  })
})

describe('allowance and amplification in an outlook', () => {
  const withRise = (mean: number, sd: number, extra: object = {}) =>
    runOutlook(
      baseInput({
        years: [2100],
        samples: 100_000,
        components: [normalComponent('other', { 2100: [mean, sd] })],
        gumbel: { location: 1, scale: 0.1 },
        ...extra,
      }),
    )

  it('matches Hunter’s allowance μ + σ²/(2λ) = 0.6125 m for μ 0.5, σ 0.15, λ 0.1', () => {
    // [memory] Hunter (2012), Climatic Change 113; [practice] arithmetic 0.5 + 0.0225/0.2 = 0.6125
    const gumbel = withRise(0.5, 0.15).byYear[0]!.gumbel!
    expect(gumbel.allowance).toBeCloseTo(0.6125, 2)
    expect(Math.abs(gumbel.allowance - 0.6125)).toBeLessThan(0.004)
  })

  it('amplifies the frequency of any level by exp(Δ/λ) = ×20.09 for Δ 0.3 m, λ 0.1 m', () => {
    // [practice] CHECKS.md amplification exp(0.3/0.1) = 20.09
    const gumbel = withRise(0.3, 0).byYear[0]!.gumbel!
    expect(gumbel.amplification).toBeCloseTo(20.09, 2)
    expect(gumbel.allowance).toBeCloseTo(0.3, 12)
    // exact Gumbel form for today's 100-year level: annual chance 1 − exp(−y·e^{Δ/λ}), y = −ln(0.99)
    const hundred = gumbel.returnPeriods.find(r => r.today === 100)!
    const chance = 1 - Math.exp(Math.log(1 / 0.99) * -Math.exp(3))
    expect(hundred.annualChance.value).toBeCloseTo(chance, 12)
    expect(hundred.newReturnPeriod).toBeCloseTo(1 / chance, 9)
    expect(hundred.level).toBeCloseTo(1 + 0.1 * 4.60015, 5)
  })

  it('without rise, a 100-year level is exceeded at least once in a 30-year life with chance 26.0 %', () => {
    // [practice] CHECKS.md: 1 − (1 − 1/100)^30 = 26.0 %
    const level100 = gumbelReturnLevel({ location: 1, scale: 0.1 }, 100)
    const result = withRise(0, 0, {
      years: [2010, 2030, 2050, 2100],
      samples: 1000,
      thresholds: [
        { key: 'quay', kind: 'flood-level', height: level100, designLifeYears: 30, lifeStartYear: 2001 },
        { key: 'long', kind: 'flood-level', height: level100, designLifeYears: 100, lifeStartYear: 2001 },
      ],
    })
    expect(result.thresholds[0]!.lifeExceedance!.value).toBeCloseTo(0.26, 3)
    expect(result.thresholds[1]!.lifeExceedance!.value).toBeCloseTo(0.634, 3)
  })

  it('with a rise, multiplies the annual chances of no exceedance year by year', () => {
    // [practice] independent annual maxima: P(none in the life) = Π_years F(h − rise_year); rise 0.4 m by
    // 2100 from 2000, linear, so 0.004 m a year; a life of 60 years from 2001 and of 30 from 2045.
    const location = 1
    const scale = 0.1
    const height = gumbelReturnLevel({ location, scale }, 100)
    const result = withRise(0.4, 0, {
      years: [2050, 2100],
      samples: 100,
      thresholds: [
        { kind: 'flood-level', height, designLifeYears: 60, lifeStartYear: 2001 },
        { kind: 'flood-level', height, designLifeYears: 30, lifeStartYear: 2045 },
      ],
    })
    const noneDuring = (first: number, last: number) => {
      let none = 1
      for (let year = first; year <= last; year++)
        none *= Math.exp(-Math.exp(-(height - 0.004 * (year - 2000) - location) / scale))
      return none
    }
    expect(result.thresholds[0]!.lifeExceedance!.value).toBeCloseTo(1 - noneDuring(2001, 2060), 10)
    expect(result.thresholds[1]!.lifeExceedance!.value).toBeCloseTo(1 - noneDuring(2045, 2074), 10)
    expect(result.thresholds[1]!.lifeExceedance!.se).toBe(0)
  })
})

describe('likelihood words', () => {
  it('takes the narrowest band and the more cautious word on every boundary', () => {
    // [pub] Mastrandrea et al. (2010) IPCC guidance note, Table 1
    const cases: Array<[number, string]> = [
      [1, 'virtually-certain'],
      [0.995, 'virtually-certain'],
      [0.99, 'extremely-likely'],
      [0.97, 'extremely-likely'],
      [0.95, 'very-likely'],
      [0.93, 'very-likely'],
      [0.9, 'likely'],
      [0.8, 'likely'],
      [0.6601, 'likely'],
      [0.66, 'about-as-likely-as-not'],
      [0.5, 'about-as-likely-as-not'],
      [0.33, 'about-as-likely-as-not'],
      [0.3299, 'unlikely'],
      [0.2, 'unlikely'],
      [0.1, 'unlikely'],
      [0.0999, 'very-unlikely'],
      [0.05, 'very-unlikely'],
      [0.0499, 'extremely-unlikely'],
      [0.01, 'extremely-unlikely'],
      [0.0099, 'exceptionally-unlikely'],
      [0, 'exceptionally-unlikely'],
    ]
    for (const [p, word] of cases) expect([p, likelihoodWord(p)]).toEqual([p, word])
  })

  it('refuses something that is not a probability', () => {
    for (const p of [-0.01, 1.01, Number.NaN]) expect(() => likelihoodWord(p)).toThrow(EngineInputError)
  })
})

describe('mass and sea level', () => {
  it('converts about 362 Gt of ice per mm of global mean rise', () => {
    // [pub] Cogley (2012), ocean area 3.62e14 m²: 1000 Gt ≈ 2.76 mm
    expect(gigatonnesToMetres(1000) * 1000).toBeCloseTo(2.76, 2)
    expect(metresToGigatonnes(0.001)).toBeCloseTo(362, 6)
    expect(gigatonnesToMetres(metresToGigatonnes(0.25))).toBeCloseTo(0.25, 12)
  })
})
