import { randomBytes } from 'node:crypto'
import { gunzipSync, gzipSync } from 'node:zlib'
import { describe, expect, it } from 'vitest'
import { deflatePieces, gzipWithInsert } from '../../../server/utils/spliced-gzip'

// The reference is zlib itself (Node's gunzip): it checks the deflate blocks, the CRC-32 and the length
// in the trailer, so a stream it accepts and inflates to the expected text is a valid gzip stream
// (RFC 1952) of that text. The same stream is what browsers inflate.

const joined = (pieces: string[], insert: string) => pieces.join(insert)
const spliced = (pieces: string[], insert: string) => {
  const deflated = deflatePieces(pieces.map(piece => Buffer.from(piece)), Buffer.byteLength(insert))
  if (!deflated) throw new Error('The pieces were refused.')
  return Buffer.concat(gzipWithInsert(deflated, Buffer.from(insert)))
}
const nonce = () => `nonce="${randomBytes(16).toString('base64')}"`

/** A page-like text that repeats itself, so the pieces refer back across inserts. */
function pageLike(pieceCount: number, pieceLength: number) {
  const words = ['<script type="module" src="/_nuxt/', 'entry.js">', '</script>', '<link rel="modulepreload" ',
    'href="/_nuxt/chunk', '.js">', 'Kelwick', ' sea level ', 'likely range ', '0.84 m', '2100']
  let seed = 7
  const next = () => (seed = (seed * 1_103_515_245 + 12_345) % 2 ** 31)
  return Array.from({ length: pieceCount }, () => {
    let piece = ''
    while (piece.length < pieceLength) piece += words[next() % words.length]
    return piece
  })
}

describe('gzip of stored pieces with a fresh insert between them', () => {
  it('inflates to the pieces joined by the insert, for a different insert each time', () => {
    const pieces = pageLike(34, 1600)
    for (let i = 0; i < 5; i++) {
      const insert = nonce()
      expect(gunzipSync(spliced(pieces, insert)).toString()).toBe(joined(pieces, insert))
    }
  })

  it('refers back across inserts, as one stream over the whole text would', () => {
    const pieces = pageLike(34, 1600)
    const insert = nonce()
    const each = pieces.reduce((sum, piece) => sum + gzipSync(piece, { level: 9 }).length, 0)
    const whole = gzipSync(joined(pieces, insert), { level: 9 }).length
    const length = spliced(pieces, insert).length
    // Pieces compressed each on its own cannot refer back; the spliced stream can, so it is far shorter.
    expect(length).toBeLessThan(each * 0.6)
    // Beside one stream over the whole: the inserts stored plainly (5 + 32 bytes each) and a block
    // header per piece (its Huffman tables, under 150 bytes here).
    expect(length).toBeLessThan(whole + 33 * 37 + 34 * 150)
  })

  it('holds for empty pieces (an insert first, last or twice in a row) and a text longer than the window', () => {
    const insert = nonce()
    for (const pieces of [['', 'a', ''], ['', ''], ['only'], pageLike(3, 40_000)]) {
      expect(gunzipSync(spliced(pieces, insert)).toString()).toBe(joined(pieces, insert))
    }
  })

  it('refuses pieces holding a zero byte, and an insert of another length than the one left for', () => {
    expect(deflatePieces([Buffer.from('a\0b'), Buffer.from('c')], 4)).toBeUndefined()
    const deflated = deflatePieces([Buffer.from('a'), Buffer.from('b')], 4)!
    expect(() => gzipWithInsert(deflated, Buffer.from('abc'))).toThrow(/length/)
  })
})
