import { nextUint32 } from './rng'

// Standard normal scores straight from the block's xoshiro128** stream, by the ziggurat method:
// G. Marsaglia and W. W. Tsang, "The Ziggurat Method for Generating Random Variables", Journal of
// Statistical Software 5(8), 2000 (their 256-strip constants r and v, their tail and wedge tests).
// As J. A. Doornik recommends ("An Improved Ziggurat Method to Generate Normal Random Samples", 2005),
// the strip index and the position inside the strip come from different bits of the random word (the
// original reuses the low bits of the position as the index, which correlates the two): of each 32-bit
// output, the low 8 bits pick the strip and the high 24 bits (sign and 23-bit magnitude) the position,
// so a score's resolution inside its strip is 2^-23 of the strip's width (at most 4.4e-7).
//
// About 98.5 % of scores cost one output, a table read, a comparison and a multiplication; the rest
// (wedges and the tail beyond r) draw further outputs from the same stream. The number of outputs a
// score uses therefore varies, but it is a pure function of the stream, so a block's scores depend on
// (seed, block) alone and splits stay bit-identical.

const STRIPS = 256
const STRIP_MASK = STRIPS - 1
/** Where the tail starts, and the area of each strip (Marsaglia and Tsang, 256 strips). */
const TAIL_START = 3.6541528853610088
const STRIP_AREA = 4.92867323399e-3
const STRIP_BITS = 8
/** The position is a signed 24-bit integer: magnitudes up to 2^23. */
const POSITION_SCALE = 2 ** 23
const TWO_TO_MINUS_32 = 1 / 4294967296

/**
 * Tables of the 256 strips, numbered as in Marsaglia and Tsang's code: strip 0 is the base (its
 * rectangle and the tail beyond r), strip 255 the widest rectangle above it, strip 1 the top one.
 * Strip i ≥ 1 spans heights f(x_i) … f(x_{i−1}) with f(x) = exp(−x²/2), x_255 = r, f(x_0) = 1.
 * `width[i]` turns a position into x (x_i / 2^23), `inner[i]` is the position magnitude below which x
 * lies under the curve for certain (2^23 · x_{i−1}/x_i), `height[i]` = f(x_i).
 */
function buildTables() {
  const width = new Float64Array(STRIPS)
  const inner = new Float64Array(STRIPS)
  const height = new Float64Array(STRIPS)
  // Marsaglia and Tsang's `zigset`, in double precision, with positions scaled by 2^23 instead of 2^31.
  let edge = TAIL_START
  let outer = edge
  const baseWidth = STRIP_AREA / Math.exp(-0.5 * edge * edge)
  inner[0] = (edge / baseWidth) * POSITION_SCALE
  inner[1] = 0
  width[0] = baseWidth / POSITION_SCALE
  width[STRIPS - 1] = edge / POSITION_SCALE
  height[0] = 1
  height[STRIPS - 1] = Math.exp(-0.5 * edge * edge)
  for (let i = STRIPS - 2; i >= 1; i--) {
    edge = Math.sqrt(-2 * Math.log(STRIP_AREA / edge + Math.exp(-0.5 * edge * edge)))
    inner[i + 1] = (edge / outer) * POSITION_SCALE
    outer = edge
    height[i] = Math.exp(-0.5 * edge * edge)
    width[i] = edge / POSITION_SCALE
  }
  return { width, inner, height }
}

const { width: WIDTH, inner: INNER, height: HEIGHT } = buildTables()

/**
 * Fills out[at … at+count−1] with standard normal scores drawn from `state` (advanced in place).
 * The fast path is inlined with the generator in locals; anything else goes through `slowScore`.
 */
export function fillNormalScores(state: Uint32Array, out: Float64Array, at: number, count: number): void {
  let s0 = state[0]! | 0
  let s1 = state[1]! | 0
  let s2 = state[2]! | 0
  let s3 = state[3]! | 0
  const end = at + count
  // Module constants read into locals: the optimizing compiler re-reads (and re-checks) module
  // bindings on every iteration otherwise.
  const inner = INNER
  const width = WIDTH
  for (let n = at; n < end; n = (n + 1) | 0) {
    // xoshiro128** step (see rng.ts).
    const m = Math.imul(s1, 5)
    const word = Math.imul((m << 7) | (m >>> 25), 9)
    const t = s1 << 9
    s2 ^= s0
    s3 ^= s1
    s1 ^= s2
    s0 ^= s3
    s2 ^= t
    s3 = (s3 << 11) | (s3 >>> 21)
    // Strip from the low 8 bits; sign and magnitude from the high 24, offset by one half so the values
    // are symmetric about 0 (literals, not STRIP_MASK and STRIP_BITS, for the reason above).
    const strip = word & 255
    const position = (word >> 8) + 0.5
    if (Math.abs(position) < inner[strip]!) {
      out[n] = position * width[strip]!
      continue
    }
    state[0] = s0
    state[1] = s1
    state[2] = s2
    state[3] = s3
    out[n] = slowScore(state, strip, position)
    s0 = state[0]! | 0
    s1 = state[1]! | 0
    s2 = state[2]! | 0
    s3 = state[3]! | 0
  }
  state[0] = s0
  state[1] = s1
  state[2] = s2
  state[3] = s3
}

/** Next output of the stream as a uniform strictly inside (0, 1), as `fillOpenUniforms` makes them. */
function openUniform(state: Uint32Array): number {
  return (nextUint32(state) + 0.5) * TWO_TO_MINUS_32
}

/**
 * Marsaglia and Tsang's `nfix`: the tail of the base strip, or the wedge test of strip `strip`, and on
 * rejection a fresh word (fast path first) until a score is accepted.
 */
export function slowScore(state: Uint32Array, strip: number, position: number): number {
  for (;;) {
    const x = position * WIDTH[strip]!
    if (strip === 0) {
      // Beyond r: Marsaglia's exponential rejection for the normal tail.
      let tail: number
      let y: number
      do {
        tail = -Math.log(openUniform(state)) / TAIL_START
        y = -Math.log(openUniform(state))
      } while (y + y < tail * tail)
      return position > 0 ? TAIL_START + tail : -TAIL_START - tail
    }
    const low = HEIGHT[strip]!
    if (low + openUniform(state) * (HEIGHT[strip - 1]! - low) < Math.exp(-0.5 * x * x)) return x
    const word = nextUint32(state) | 0
    strip = word & STRIP_MASK
    position = (word >> STRIP_BITS) + 0.5
    if (Math.abs(position) < INNER[strip]!) return position * WIDTH[strip]!
  }
}
