import { describe, expect, it } from 'vitest'
import { pieceSizes, ROWS_PER_PIECE } from '../../../shared/briefing/table-pieces'

describe('cutting a PDF table into pieces', () => {
  it('keeps a table that fits in one piece', () => {
    expect(pieceSizes(1)).toEqual([1])
    expect(pieceSizes(ROWS_PER_PIECE)).toEqual([ROWS_PER_PIECE])
  })

  it('never leaves one row alone, and never passes the most a piece holds', () => {
    // [practice] 13 rows over pieces of at most 12: 7 + 6, not 12 + 1.
    expect(pieceSizes(13)).toEqual([7, 6])
    for (let rows = 2; rows <= 200; rows++) {
      const sizes = pieceSizes(rows)
      expect(sizes.reduce((a, b) => a + b, 0)).toBe(rows)
      expect(Math.max(...sizes)).toBeLessThanOrEqual(ROWS_PER_PIECE)
      expect(Math.min(...sizes)).toBeGreaterThanOrEqual(2)
    }
  })
})
