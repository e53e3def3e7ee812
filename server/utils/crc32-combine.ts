// CRC-32 (the gzip polynomial, reflected) of two texts joined, from the CRC of each and the second's
// length, as zlib's crc32_combine does (crc32.c, zlib 1.2.12 and later): the first CRC is multiplied
// by x^(8·length) modulo the polynomial in GF(2) and added to the second. Node has crc32 but not its
// combine. The shift for a length is worked out once (`crc32Shift`), so joining costs one product of
// at most 32 steps, however long the second text is: a cached page's CRC per response without reading
// its bytes again.

const POLYNOMIAL = 0xEDB88320

/** a·b modulo the polynomial, both reflected (bit 31 is x⁰). */
function multiplyModulo(a: number, b: number) {
  let product = 0
  for (let bit = 0x80000000; bit !== 0; bit >>>= 1) {
    if ((a & bit) !== 0) product ^= b
    b = b & 1 ? (b >>> 1) ^ POLYNOMIAL : b >>> 1
  }
  return product >>> 0
}

// x^(2^k) modulo the polynomial for k = 0 … 31, starting from x¹ (reflected: bit 30).
const POWERS_OF_TWO: number[] = [0x40000000]
for (let k = 1; k < 32; k++) POWERS_OF_TWO.push(multiplyModulo(POWERS_OF_TWO[k - 1]!, POWERS_OF_TWO[k - 1]!))

/** x^(8·length) modulo the polynomial: what a CRC is multiplied by when `length` bytes follow it. */
export function crc32Shift(length: number) {
  let power = 0x80000000 // x⁰
  // 8·length = length·2³: the bits of length pick x^(2^(k+3)).
  for (let k = 3, rest = length; rest > 0; k++, rest = Math.floor(rest / 2)) {
    if (rest % 2) power = multiplyModulo(POWERS_OF_TWO[k % 32]!, power)
  }
  return power
}

/** CRC-32 of A followed by B, from crc(A), crc(B) and crc32Shift(length of B). */
export function crc32Combine(crcA: number, crcB: number, shiftB: number) {
  return (multiplyModulo(shiftB, crcA) ^ crcB) >>> 0
}
