import { describe, expect, it } from 'vitest'
import { designLifeLevelSentence, lifeSentence } from '../../../shared/wording/flood'

const nb = (text: string) => text.replace(/\u00A0/g, ' ')

describe('flood levels in Spanish', () => {
  it('contracts "de el" only where the chance has an article', () => {
    expect(nb(lifeSentence({ buildYear: 2031, lifeYears: 50, chance: 0.4 }, 'es'))).toMatch(/: una probabilidad del 40 % \(/)
    expect(nb(lifeSentence({ buildYear: 2031, lifeYears: 50, chance: 0.999 }, 'es'))).toMatch(/: una probabilidad de más del 99 % \(/)
    expect(nb(designLifeLevelSentence({ chance: 0.1, level: 2.95 }, { datum: 'CD', unit: 'm', language: 'es' }))).toMatch(/^Para que la probabilidad de al menos un rebase en esa vida útil sea del 10 %, la cota/)
  })
})
