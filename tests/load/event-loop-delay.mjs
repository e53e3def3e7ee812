// Loaded into the built server by `npm run load:upload` (NODE_OPTIONS=--import): measures how late the
// server's request thread runs its callbacks. Each SIGUSR2 writes what it measured since the previous
// one to EVENT_LOOP_DELAY_OUT, as JSON in milliseconds, and starts afresh.
import { writeFileSync } from 'node:fs'
import { monitorEventLoopDelay } from 'node:perf_hooks'

const histogram = monitorEventLoopDelay({ resolution: 5 })
histogram.enable()
let window = 0
const ms = nanoseconds => Math.round(nanoseconds / 1e4) / 100

process.on('SIGUSR2', () => {
  window++
  const figures = { window, max: ms(histogram.max), p99: ms(histogram.percentile(99)), mean: ms(histogram.mean) }
  writeFileSync(process.env.EVENT_LOOP_DELAY_OUT, JSON.stringify(figures))
  histogram.reset()
})
