import { describe, expect, it } from 'vitest'
import { axisNumberFormat } from '../../../utils/chartStyle'

describe('chart axis numbers', () => {
  it('write a Spanish axis with a decimal comma and an English one with a point, grouped as the tables are', () => {
    const es = axisNumberFormat('es')
    const en = axisNumberFormat('en')
    expect([0.5, -0.25, 1.125].map(es)).toEqual(['0,5', '-0,25', '1,125'])
    expect([0.5, -0.25, 1.125].map(en)).toEqual(['0.5', '-0.25', '1.125'])
    // [practice] Spanish (CLDR) groups thousands only from five digits on: 1000, but 10.000.
    expect([1000, 10000].map(es)).toEqual(['1000', '10.000'])
    expect(en(10000)).toBe('10,000')
  })
})
