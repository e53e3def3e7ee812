import { describe, expect, it } from 'vitest'
import {
  aChance,
  chanceAfterDe,
  chanceAsOdds,
  formatChance,
  headlineSentence,
  likelihoodPhrase,
  samplingNote,
} from '../../../shared/wording/chance'

const nb = (text: string) => text.replace(/\u00A0/g, ' ')

describe('chances in words', () => {
  it('gives the number first, then the calibrated word, at the edges and on the band boundaries', () => {
    // [pub] Mastrandrea et al. (2010) Table 1: nested bands, the more cautious word on a boundary.
    const cases: Array<[number, string, string]> = [
      [0, 'less than 1 %', 'exceptionally unlikely'],
      [0.01, '1 %', 'extremely unlikely'],
      [0.33, '33 %', 'about as likely as not'],
      [0.66, '66 %', 'about as likely as not'],
      [0.99, '99 %', 'extremely likely'],
      [1, 'more than 99 %', 'virtually certain'],
    ]
    for (const [p, chance, word] of cases) {
      expect(nb(formatChance(p, 'en'))).toBe(chance)
      expect(likelihoodPhrase(p, 'en')).toBe(word)
    }
  })

  it('speaks Spanish with the calibrated Spanish terms', () => {
    expect(nb(formatChance(0, 'es'))).toBe('menos del 1 %')
    expect(likelihoodPhrase(0.25, 'es')).toBe('improbable')
    expect(likelihoodPhrase(0.95, 'es')).toBe('muy probable')
    expect(chanceAsOdds(0.25, 'es')).toBe('aproximadamente 1 entre 4')
  })

  it('puts chances as odds a council can picture', () => {
    expect(chanceAsOdds(0.25, 'en')).toBe('about a 1-in-4 chance')
    expect(chanceAsOdds(0.26, 'en')).toBe('about a 1-in-4 chance')
    expect(chanceAsOdds(0.1, 'en')).toBe('about a 1-in-10 chance')
    expect(chanceAsOdds(0.74, 'en')).toBe('about 3 in 4')
    expect(chanceAsOdds(0.005, 'en')).toBe('less than 1 in 100')
    expect(chanceAsOdds(0.995, 'en')).toBe('near certain')
  })

  it('mentions sampling error only when it could change the rounded figure', () => {
    expect(samplingNote(0.001, 'en')).toBeNull()
    expect(nb(samplingNote(0.004, 'en')!)).toBe('± 0.8 % from sampling')
  })

  it('builds the headline sentence in the chosen units and language', () => {
    const parts = {
      probability: 0.234,
      standardError: 0.0013,
      height: 0.5,
      year: 2070,
      referenceLevel: 'mean sea level 2020',
      unit: 'm' as const,
      language: 'en' as const,
    }
    expect(nb(headlineSentence(parts))).toBe(
      'There is a 23 % chance (unlikely) that the mean sea level here will be more than 0.50 m above mean sea level 2020 by 2070.',
    )
    // [practice] 0.5 m is 1.64 ft (international foot, 0.3048 m).
    expect(nb(headlineSentence({ ...parts, unit: 'ft' }))).toContain('more than 1.6 ft above')
    expect(nb(headlineSentence({ ...parts, language: 'es' }))).toBe(
      'Hay una probabilidad del 23 % (improbable) de que el nivel medio del mar aquí esté más de 0,50 m por encima de mean sea level 2020 en 2070.',
    )
  })

  it('gives no calibrated word to a chance that lies beyond what the releases publish', () => {
    const parts = {
      probability: 0.004,
      standardError: 0.0002,
      extrapolated: true,
      height: 1.2,
      year: 2100,
      referenceLevel: 'chart datum',
      unit: 'm' as const,
      language: 'en' as const,
    }
    const sentence = nb(headlineSentence(parts))
    expect(sentence).toBe(
      'There is a less than 1 % chance (extrapolated: the releases do not describe this tail) that the mean sea level here will be more than 1.20 m above chart datum by 2100.',
    )
    expect(sentence).not.toMatch(/unlikely/)
    expect(nb(headlineSentence({ ...parts, language: 'es' }))).toMatch(
      /\(extrapolada: las versiones publicadas no describen esta cola\)/,
    )
  })

  it('reads as Spanish at the edges: "de menos del 1 %", never "del menos del 1 %", and a decimal comma in the sampling note', () => {
    const parts = {
      probability: 0.002,
      standardError: 0.004,
      height: 0.5,
      year: 2070,
      referenceLevel: 'NMM 2020',
      unit: 'm' as const,
      language: 'es' as const,
    }
    expect(nb(headlineSentence(parts))).toBe(
      'Hay una probabilidad de menos del 1 % (excepcionalmente improbable; ± 0,8 % por el muestreo) de que el nivel medio del mar aquí esté más de 0,50 m por encima de NMM 2020 en 2070.',
    )
    expect(nb(headlineSentence({ ...parts, probability: 0.999 }))).toMatch(/^Hay una probabilidad de más del 99 % /)
    expect(nb(chanceAfterDe(0.4))).toBe('del 40 %')
  })

  it('reads "an" before 8, 11, 18 and the eighties', () => {
    // [practice] English article by sound: "an eighteen", "a twenty-three".
    expect(aChance(0.18).replace(/\u00A0/g, ' ')).toBe('an 18 %')
    expect(aChance(0.08).replace(/\u00A0/g, ' ')).toBe('an 8 %')
    expect(aChance(0.85).replace(/\u00A0/g, ' ')).toBe('an 85 %')
    expect(aChance(0.23).replace(/\u00A0/g, ' ')).toBe('a 23 %')
    expect(aChance(0.001).replace(/\u00A0/g, ' ')).toBe('a less than 1 %')
  })
})
