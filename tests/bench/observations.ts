import { finishOutlook, planOutlook, runBlocks, type OutlookInput } from '../../shared/engine'
import { loadWorkload } from './workload'

// What weighting by an observed record adds to an outlook: W1 at N = 100,000 on one thread, with and
// without a 60-year annual record (AR(1) residuals as a gauge fit gives them), alternated in one process
// so phases of the machine move both alike. Target: at most 20 % more time.

const PAIRS = Number(process.env.BENCH_OBSERVATION_PAIRS ?? 15)
const RECORD_YEARS = 60
export const WEIGHTING_TARGET = 1.2

/**
 * A record along W1's own median (linear between output years) with AR(1) residuals of 3 cm, correlated
 * 0.5 from year to year (a fixed stream, so every run weighs the same record): what a gauge fit of a
 * site tracking its projection gives.
 */
function withRecord(input: OutlookInput, medianRise: (year: number) => number): OutlookInput {
  const times = Array.from({ length: RECORD_YEARS }, (_, i) => input.baselineYear + 0.5 + i)
  let state = 12345
  const uniform = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0
    return (state + 0.5) / 2 ** 32
  }
  const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
  const sd = 0.03
  const phi = 0.5
  let residual = sd * normal()
  const rise = times.map((time) => {
    const value = medianRise(time) + residual
    residual = phi * residual + sd * Math.sqrt(1 - phi * phi) * normal()
    return value
  })
  return { ...input, observations: { times, rise, residualSd: sd, phi } }
}

function timed(input: OutlookInput): number {
  const start = performance.now()
  const plan = planOutlook(input)
  finishOutlook(plan, runBlocks(plan, 0, plan.blockCount))
  return performance.now() - start
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  const middle = sorted.length >> 1
  return sorted.length % 2 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2
}

export function benchObservationWeighting(samples = 100_000) {
  const plain = loadWorkload(samples)
  const reference = planOutlook(plain)
  const outlook = finishOutlook(reference, runBlocks(reference, 0, reference.blockCount))
  const medianRise = (year: number) => {
    const t = outlook.years.findIndex(y => y >= year)
    const at = (k: number) => outlook.byYear[k]!.percentiles[3]!.value
    const from = outlook.years[t - 1]!
    return at(t - 1) + ((at(t) - at(t - 1)) * (year - from)) / (outlook.years[t]! - from)
  }
  const weighted = withRecord(plain, medianRise)
  for (let i = 0; i < 3; i++) {
    timed(plain)
    timed(weighted)
  }
  const plainTimes: number[] = []
  const weightedTimes: number[] = []
  const ratios: number[] = []
  // A, B, A: each weighted run against the mean of the plain runs either side of it.
  let before = timed(plain)
  for (let i = 0; i < PAIRS; i++) {
    const b = timed(weighted)
    const after = timed(plain)
    plainTimes.push(before)
    weightedTimes.push(b)
    ratios.push(b / ((before + after) / 2))
    before = after
  }
  const plan = planOutlook(weighted)
  const update = finishOutlook(plan, runBlocks(plan, 0, plan.blockCount)).observationUpdate!
  const ratio = median(ratios)
  return {
    samples,
    recordYears: RECORD_YEARS,
    singleThreadPlainMedianMs: +median(plainTimes).toFixed(1),
    singleThreadWeightedMedianMs: +median(weightedTimes).toFixed(1),
    medianRatio: +ratio.toFixed(3),
    extraPercent: +((ratio - 1) * 100).toFixed(1),
    target: `at most ${Math.round((WEIGHTING_TARGET - 1) * 100)} % extra`,
    met: ratio <= WEIGHTING_TARGET,
    ess: Math.round(update.ess),
    refused: update.refused,
  }
}
