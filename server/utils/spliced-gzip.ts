import { constants, crc32, deflateRawSync } from 'node:zlib'
import { crc32Combine, crc32Shift } from './crc32-combine'

// A gzip stream (RFC 1952 around RFC 1951 deflate) made of pieces compressed once and a short insert,
// different for every response, written between them as stored (uncompressed) deflate blocks. The
// shared-page cache sends each reader its own CSP nonce this way without compressing the page again.
//
// Each piece is compressed with the pieces before it as its dictionary, so it may refer back to them as
// one deflate stream of the whole page would, but with zero bytes standing where the inserts go: page
// text has no zero bytes, so no back-reference can reach into an insert, whose bytes differ per
// response. Each piece ends with a sync flush, which leaves the stream on a byte boundary with no
// block marked final, so the stored blocks and the next piece follow directly.

export interface DeflatedPieces {
  deflated: Buffer[]
  /** Each piece's CRC-32 and shift (crc32-combine.ts), so a response's CRC never reads the page. */
  crcs: number[]
  shifts: number[]
  plainLength: number
  insertLength: number
  insertShift: number
}

const WINDOW = 32 * 1024
// ID1 ID2, CM = deflate, no flags, no mtime, no extra flags, OS unknown.
const HEADER = Buffer.from([0x1F, 0x8B, 0x08, 0, 0, 0, 0, 0, 0, 0xFF])
// A final, empty stored block: BFINAL = 1, BTYPE = 00, LEN = 0, NLEN = ~0.
const FINAL_BLOCK = Buffer.from([0x01, 0x00, 0x00, 0xFF, 0xFF])

/**
 * Compresses the pieces that will surround inserts of `insertLength` bytes; undefined when a piece
 * holds a zero byte (a back-reference could then reach into an insert) or the insert is too long for
 * one stored block.
 */
export function deflatePieces(pieces: Buffer[], insertLength: number): DeflatedPieces | undefined {
  if (insertLength > 0xFFFF || pieces.some(piece => piece.includes(0))) return undefined
  const hole = Buffer.alloc(insertLength)
  const deflated: Buffer[] = []
  let before = Buffer.alloc(0)
  for (const piece of pieces) {
    const dictionary = before.subarray(Math.max(0, before.length - WINDOW))
    deflated.push(deflateRawSync(piece, {
      level: constants.Z_BEST_COMPRESSION,
      finishFlush: constants.Z_SYNC_FLUSH,
      ...(dictionary.length ? { dictionary } : {}),
    }))
    before = Buffer.concat([dictionary, piece, hole])
  }
  return {
    deflated,
    crcs: pieces.map(piece => crcOf(piece)),
    shifts: pieces.map(piece => crc32Shift(piece.length)),
    plainLength: pieces.reduce((sum, piece) => sum + piece.length, 0),
    insertLength,
    insertShift: crc32Shift(insertLength),
  }
}

// zlib answers crc32 of no bytes with 0 whatever it is given; 0 is also the CRC of no bytes.
const crcOf = (bytes: Buffer) => (bytes.length ? crc32(bytes) : 0)

/** The gzip stream of the pieces with `insert` between each two, as chunks to write in order. */
export function gzipWithInsert(pieces: DeflatedPieces, insert: Buffer): Buffer[] {
  if (insert.length !== pieces.insertLength) throw new Error('The insert does not have the length the pieces left for it.')
  // A stored block that is not the last: BFINAL = 0, BTYPE = 00 (padded to the byte), LEN, NLEN = ~LEN.
  const storedHeader = Buffer.alloc(5)
  storedHeader.writeUInt16LE(insert.length, 1)
  storedHeader.writeUInt16LE(~insert.length & 0xFFFF, 3)
  const insertCrc = crcOf(insert)
  const chunks: Buffer[] = [HEADER]
  let crc = 0
  pieces.deflated.forEach((deflated, i) => {
    if (i > 0) {
      chunks.push(storedHeader, insert)
      crc = crc32Combine(crc, insertCrc, pieces.insertShift)
    }
    chunks.push(deflated)
    crc = crc32Combine(crc, pieces.crcs[i]!, pieces.shifts[i]!)
  })
  const trailer = Buffer.alloc(8)
  trailer.writeUInt32LE(crc, 0)
  trailer.writeUInt32LE((pieces.plainLength + (pieces.deflated.length - 1) * insert.length) >>> 0, 4)
  chunks.push(FINAL_BLOCK, trailer)
  return chunks
}
