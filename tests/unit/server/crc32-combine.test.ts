import { randomBytes } from 'node:crypto'
import { crc32 } from 'node:zlib'
import { describe, expect, it } from 'vitest'
import { crc32Combine, crc32Shift } from '../../../server/utils/crc32-combine'

// The reference is zlib's own CRC-32 (Node's zlib.crc32) of the joined bytes; the check value
// crc32("123456789") = 0xCBF43926 is the standard one for this CRC (RFC 1952's CRC-32).

// zlib answers crc32 of no bytes with 0, which is the CRC of no bytes.
const crcOf = (bytes: Buffer) => (bytes.length ? crc32(bytes) : 0)

describe('CRC-32 of joined texts from the CRC of each', () => {
  it('equals zlib over the joined bytes, for lengths from 0 to past 2^16', () => {
    for (const [a, b] of [[0, 0], [1, 0], [0, 1], [3, 5], [1000, 1], [7, 65_537], [40_000, 123_457]] as const) {
      const first = randomBytes(a)
      const second = randomBytes(b)
      expect(crc32Combine(crcOf(first), crcOf(second), crc32Shift(b))).toBe(crcOf(Buffer.concat([first, second])))
    }
  })

  it('gives the standard check value for "123456789" joined from two pieces', () => {
    expect(crc32Combine(crc32('1234'), crc32('56789'), crc32Shift(5))).toBe(0xCBF43926)
  })
})
