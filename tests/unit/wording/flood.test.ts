import { describe, expect, it } from 'vitest'
import {
  amplificationSentence,
  designLifeLevelSentence,
  lifeSentence,
  todaysLevelExpected,
} from '../../../shared/wording/flood'
import { samplingPrecision } from '../../../shared/wording/chance'

const nb = (text: string) => text.replace(/\u00A0/g, ' ')

describe('flood levels in Spanish', () => {
  it('contracts "de el" only where the chance has an article', () => {
    expect(nb(lifeSentence({ buildYear: 2031, lifeYears: 50, chance: 0.4 }, 'es'))).toMatch(
      /: una probabilidad del 40 % \(/,
    )
    expect(nb(lifeSentence({ buildYear: 2031, lifeYears: 50, chance: 0.999 }, 'es'))).toMatch(
      /: una probabilidad de más del 99 % \(/,
    )
    expect(
      nb(designLifeLevelSentence({ chance: 0.1, level: 2.95 }, { datum: 'CD', unit: 'm', language: 'es' })),
    ).toMatch(/^Para que la probabilidad de al menos un rebase en esa vida útil sea del 10 %, la cota/)
  })
})

describe('amplification as expected floods', () => {
  it('counts expected floods of today’s level, and says the chance in a year beside it', () => {
    // [practice] today's 100-year level is expected −ln(1 − 1/100) = 0.01005 times a year; ×18.3 gives
    // 0.184 a year, about once every 5.4 years; its chance in a year is smaller and is given separately.
    expect(todaysLevelExpected({ today: 100, amplification: 18.3 }, 'en')).toBe(
      'about once every 5.4 years (18.3 times as many expected floods as today)',
    )
    expect(nb(amplificationSentence({ today: 100, amplification: 18.3, annualChance: 0.18 }, 'en'))).toBe(
      'Without that raise, today’s 100-year level would be reached about once every 5.4 years (18.3 times as many expected floods as today): an 18 % chance in any one year.'.replace(
        '’',
        '\'',
      ),
    )
    expect(nb(amplificationSentence({ today: 100, amplification: 18.3, annualChance: 0.18 }, 'es'))).toBe(
      'Sin esa elevación, el nivel de 100 años de hoy se alcanzaría aproximadamente una vez cada 5,4 años (18,3 veces más inundaciones esperadas que hoy): una probabilidad del 18 % en un año cualquiera.',
    )
  })

  it('says "every year or more often" past one expected event a year, never a huge multiple', () => {
    // [practice] ×100 of a 100-year level: 100 × 0.01005 = 1.005 expected a year.
    for (const amplification of [100, 3.13e10]) {
      expect(todaysLevelExpected({ today: 100, amplification }, 'en')).toBe('every year or more often')
      expect(todaysLevelExpected({ today: 100, amplification }, 'es')).toBe('todos los años o más a menudo')
    }
    expect(todaysLevelExpected({ today: 100, amplification: 99 }, 'en')).toMatch(/^about once every 1 years \(99 times/)
  })
})

describe('sampling precision of a chance', () => {
  it('gives the standard error, or the rule-of-three bound where no sample reached the level', () => {
    expect(nb(samplingPrecision({ value: 0.2, se: 0.0012 }, 'en'))).toBe('Sampling standard error: 0.12 %.')
    // [practice: rule of three] 0 of 10,000 samples: below 3/10,000 = 0.03 % at 95 %.
    expect(nb(samplingPrecision({ value: 0, se: 0, upperBound95: 0.0003 }, 'en'))).toBe(
      'Below 0.03 % at 95 % confidence: no sample reached it.',
    )
    expect(nb(samplingPrecision({ value: 0, se: 0, upperBound95: 0.0003 }, 'es'))).toBe(
      'Menos del 0,03 % con un 95 % de confianza: ninguna muestra llegó a ella.',
    )
  })
})
