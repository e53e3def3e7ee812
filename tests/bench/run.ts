import os from 'node:os'
import { planOutlook, runBlocks, finishOutlook, type OutlookResult } from '../../shared/engine'
import { benchObservationWeighting } from './observations'
import { OutlookPool } from './pool'
import { loadWorkload } from './workload'

// `npm run bench`: W1 at N = 100,000 and 1,000,000 on a warmed pool of worker threads (and, for
// comparison, on one thread). Prints JSON. Each timed run is what a server does for a new request with
// a warm pool: validate and plan the input, send the plan with each worker's block range, sample,
// merge the partials and finish the outlook.

const RUNS = Number(process.env.BENCH_RUNS ?? 7)
/**
 * Warm-up before timing, per size: at least this many runs and at least WARM_UP_MS of them. A server
 * answers many requests, so its calling thread's code (validating, planning, merging, finishing) is
 * optimized by V8; three warm-ups left planning at 0.7–1.9 ms instead of 0.3 ms and the pool's medians
 * spread from 18 to 28 ms between bench runs. A second of warm-up (about 50 runs at 100k) steadied them.
 */
const WARM_UPS = Number(process.env.BENCH_WARM_UPS ?? 3)
const WARM_UP_MS = Number(process.env.BENCH_WARM_UP_MS ?? 1000)
const WORKERS = Number(process.env.BENCH_WORKERS ?? 2)
const MAIN_SHARE = process.env.BENCH_MAIN_SHARE === '1'

function summary(times: number[]) {
  const sorted = [...times].sort((a, b) => a - b)
  const middle = sorted.length >> 1
  const median = sorted.length % 2 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2
  return { medianMs: +median.toFixed(1), minMs: +sorted[0]!.toFixed(1), runs: sorted.length }
}

function headline(result: OutlookResult) {
  const t = result.years.indexOf(2100)
  const year = result.byYear[t]!
  const metre = result.heights.findIndex(height => Math.abs(height - 1) < 1e-9)
  return {
    percentiles2100: Object.fromEntries(
      year.percentiles.map(p => [`p${Math.round(p.level * 100)}`, +p.value.toFixed(4)]),
    ),
    mean2100: +year.mean.value.toFixed(4),
    sd2100: +year.sd.toFixed(4),
    exceed1m2100: { p: year.exceedance[metre]!.value, se: +year.exceedance[metre]!.se.toFixed(5) },
  }
}

async function main() {
  const pool = new OutlookPool(WORKERS, MAIN_SHARE)
  const report: Record<string, unknown> = {
    workload: 'tests/bench/workload-w1.json',
    machine: {
      cpus: os.cpus().length,
      model: os.cpus()[0]?.model,
      node: process.version,
      loadAverage: os.loadavg().map(x => +x.toFixed(2)),
    },
    date: new Date().toISOString(),
    pool: { workers: WORKERS, mainThreadShare: MAIN_SHARE },
    timed: 'per run: validate + plan, plan sent to warm workers, sample, merge, finish',
    warmUp: { minRuns: WARM_UPS, minMs: WARM_UP_MS },
  }
  for (const samples of [100_000, 1_000_000]) {
    const input = loadWorkload(samples)
    // The first run also waits for the workers to start; the warm-up time counts from its end.
    await pool.run(planOutlook(input))
    let warmUps = 1
    for (const start = performance.now(); warmUps < WARM_UPS || performance.now() - start < WARM_UP_MS; warmUps++)
      await pool.run(planOutlook(input))
    const pooled: number[] = []
    let result: OutlookResult | null = null
    for (let i = 0; i < RUNS; i++) {
      const start = performance.now()
      result = await pool.run(planOutlook(input))
      pooled.push(performance.now() - start)
    }
    const single: number[] = []
    let singleResult: OutlookResult | null = null
    // Warmed like the pool's threads, so both figures time compiled code.
    const singleRun = () => {
      const plan = planOutlook(input)
      return finishOutlook(plan, runBlocks(plan, 0, plan.blockCount))
    }
    for (let i = 0, start = performance.now(); i < WARM_UPS || performance.now() - start < WARM_UP_MS; i++) singleRun()
    for (let i = 0; i < Math.min(RUNS, 5); i++) {
      const start = performance.now()
      singleResult = singleRun()
      single.push(performance.now() - start)
    }
    report[`N=${samples}`] = {
      pool: { ...summary(pooled), warmUpRuns: warmUps },
      singleThread: summary(single),
      identicalToSingleThread: JSON.stringify(result) === JSON.stringify(singleResult),
      percentileResolutionM: result!.percentileResolution,
      ...headline(result!),
    }
  }
  report.observationWeighting = benchObservationWeighting()
  report.peakRssMB = +(process.resourceUsage().maxRSS / 1024).toFixed(1)
  // Other work on the machine shows here: figures taken beside builds or tests are not comparable.
  report.loadAverageAtEnd = os.loadavg().map(x => +x.toFixed(2))
  await pool.close()
  console.log(JSON.stringify(report, null, 2))
}

await main()
