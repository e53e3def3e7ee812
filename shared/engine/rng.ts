// Random streams.
//
// Generator: xoshiro128** 1.1 (D. Blackman and S. Vigna, "Scrambled linear pseudorandom number
// generators", ACM TOMS 47(4), 2021; reference code at prng.di.unimi.it). 32-bit words suit
// JavaScript's Math.imul and uint32 arithmetic, so the hot loop never touches BigInt. The sample loop
// turns the outputs into normal scores itself (`ziggurat.ts`, generator inlined).
//
// Seeding: SplitMix64 (G. Steele, D. Lea, C. Flood, "Fast splittable pseudorandom number generators",
// OOPSLA 2014), the seeder the xoshiro authors recommend. Each block of samples has its own stream:
// SplitMix64 starts from `seed + blockIndex · 2^53` and its first two outputs (low word, then high
// word of each) are the four xoshiro128** state words. Any assignment of blocks to threads therefore
// draws exactly the same numbers.

const MASK64 = (1n << 64n) - 1n

/** SplitMix64 step: returns [next state, output]. */
export function splitMix64(state: bigint): [bigint, bigint] {
  const next = (state + 0x9e3779b97f4a7c15n) & MASK64
  let z = next
  z = ((z ^ (z >> 30n)) * 0xbf58476d1ce4e5b9n) & MASK64
  z = ((z ^ (z >> 27n)) * 0x94d049bb133111ebn) & MASK64
  return [next, z ^ (z >> 31n)]
}

/** The largest seed accepted: seeds and block indices share one 64-bit SplitMix64 state. */
export const MAX_SEED = Number.MAX_SAFE_INTEGER
const BLOCK_INDEX_SHIFT = 1n << 53n

/** xoshiro128** state for one block of one outlook. */
export function blockStreamState(seed: number, blockIndex: number): Uint32Array {
  let state = (BigInt(seed) + BigInt(blockIndex) * BLOCK_INDEX_SHIFT) & MASK64
  const words = new Uint32Array(4)
  for (let i = 0; i < 2; i++) {
    const [next, output] = splitMix64(state)
    state = next
    words[2 * i] = Number(output & 0xffffffffn)
    words[2 * i + 1] = Number(output >> 32n)
  }
  // The all-zero state is xoshiro's only fixed point; SplitMix64 cannot give two zero outputs in a row
  // from one state, but the guard keeps the invariant local.
  if ((words[0]! | words[1]! | words[2]! | words[3]!) === 0) words[0] = 1
  return words
}

/** Advances `state` in place and returns the next 32-bit output (as an unsigned number). */
export function nextUint32(state: Uint32Array): number {
  const s0 = state[0]!
  const s1 = state[1]!
  const s2 = state[2]!
  const s3 = state[3]!
  const m = Math.imul(s1, 5)
  const result = Math.imul((m << 7) | (m >>> 25), 9) >>> 0
  const t = s1 << 9
  const n2 = s2 ^ s0
  const n3 = s3 ^ s1
  state[1] = s1 ^ n2
  state[0] = s0 ^ n3
  state[2] = n2 ^ t
  state[3] = (n3 << 11) | (n3 >>> 21)
  return result
}
