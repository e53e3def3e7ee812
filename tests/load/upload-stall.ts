// `npm run load:upload`: how long a large upload holds the server's request thread. The built server on
// loopback (in-memory database) takes UPLOAD_ROUNDS (5) uploads of UPLOAD_DRAWS (100,000) land-motion
// draws one after another, while a probe asks /api/health again as soon as each answer arrives. Prints
// JSON: for the quiet time before and for each upload, the health answers' slowest and median time and
// the server's own event-loop delay (tests/load/event-loop-delay.mjs, loaded into it). Build first.
import { existsSync, mkdtempSync, readFileSync } from 'node:fs'
import { tmpdir, loadavg } from 'node:os'
import { join, resolve } from 'node:path'
import { setTimeout as delay } from 'node:timers/promises'
import { ApiClient } from '../support/client'
import { PLANNER } from '../support/demo-users'
import { SERVER_ENTRY, startServer, type RunningServer } from '../support/server'

const DRAWS = Number(process.env.UPLOAD_DRAWS ?? 100_000)
const ROUNDS = Number(process.env.UPLOAD_ROUNDS ?? 5)
const QUIET_MS = 2000

function drawsCsv(n: number) {
  const rows = Array.from({ length: n }, (_, k) => `${n - k},${(-2 - 6 * ((n - k) / n) ** 3).toFixed(4)}`)
  return `draw,rate_mm_per_year\n${rows.join('\n')}\n`
}

/** Asks /api/health back to back until stopped; the answers' times in ms. */
function probeHealth(url: string) {
  const times: number[] = []
  let stopped = false
  const running = (async () => {
    while (!stopped) {
      const started = performance.now()
      await (await fetch(`${url}/api/health`)).arrayBuffer()
      times.push(performance.now() - started)
    }
  })()
  return async () => {
    stopped = true
    await running
    const sorted = times.sort((a, b) => a - b)
    const at = (p: number) => Math.round(sorted[Math.floor((sorted.length - 1) * p)]! * 10) / 10
    return { answers: sorted.length, slowestMs: at(1), medianMs: at(0.5) }
  }
}

/** The server's event-loop delay since the previous call (see event-loop-delay.mjs). */
async function eventLoopDelay(server: RunningServer, out: string, window: number) {
  process.kill(server.pid, 'SIGUSR2')
  for (;;) {
    const written = existsSync(out) ? JSON.parse(readFileSync(out, 'utf8') || '{}') : {}
    if (written.window === window) return { maxMs: written.max, p99Ms: written.p99, meanMs: written.mean }
    await delay(5)
  }
}

async function main() {
  if (!existsSync(SERVER_ENTRY)) throw new Error('No built server: run `npm run build` first.')
  const out = join(mkdtempSync(join(tmpdir(), 'brinkwater-upload-')), 'event-loop-delay.json')
  const preload = resolve(import.meta.dirname, 'event-loop-delay.mjs')
  const server = await startServer({
    NODE_OPTIONS: `${process.env.NODE_OPTIONS ?? ''} --import ${preload}`.trim(),
    EVENT_LOOP_DELAY_OUT: out,
  })
  try {
    const planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
    const siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Lowmere').id
    const body = { csv: drawsCsv(DRAWS), source: 'gps' }
    const loadAtStart = loadavg()[0]
    let window = 0
    await eventLoopDelay(server, out, ++window)

    const stopQuiet = probeHealth(server.url)
    await delay(QUIET_MS)
    const quiet = { health: await stopQuiet(), eventLoop: await eventLoopDelay(server, out, ++window) }

    const uploads = []
    for (let round = 0; round < ROUNDS; round++) {
      const stop = probeHealth(server.url)
      const started = performance.now()
      const answer = await planner.post(`/api/sites/${siteId}/land-motion-draws`, body)
      const uploadMs = Math.round(performance.now() - started)
      if (answer.status !== 201) throw new Error(`The upload answered ${answer.status}: ${JSON.stringify(answer.body)}`)
      uploads.push({ uploadMs, health: await stop(), eventLoop: await eventLoopDelay(server, out, ++window) })
    }
    console.log(JSON.stringify({ draws: DRAWS, loadAtStart, loadAtEnd: loadavg()[0], quiet, uploads }, null, 2))
  }
  finally {
    await server.stop()
  }
}

await main()
