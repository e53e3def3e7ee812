// `npm run load`: the built server on loopback with a database in a temporary folder, a shared
// briefing set up through the API as the demo planner, then autocannon against (a) the public shared
// briefing page as a browser asks for it (gzip accepted), (b) a stored outlook revalidated by signed-in
// planners as a browser does (gzip accepted, If-None-Match with the ETag of a first read: 304), (c) the
// outlook's status and (d) the stored outlook read in full (gzip, no ETag: a reader's first visit).
// Prints JSON with `met` per target; build first.
//
// Set-up runs in a first server process (creating the database, computing the outlook); the load
// runs against a second process opened on the same folder, as a deployed server is: PGlite's
// first-time initdb alone peaks at about 700 MB, while opening an existing folder takes about 250 MB.
import { existsSync, readFileSync } from 'node:fs'
import { mkdtemp, rm } from 'node:fs/promises'
import { cpus, loadavg, tmpdir, totalmem } from 'node:os'
import { join } from 'node:path'
import autocannon from 'autocannon'
import { ApiClient } from '../support/client'
import { PLANNER } from '../support/demo-users'
import {
  SERVER_ENTRY,
  SERVER_NODE_OPTIONS,
  createTestDatabase,
  startServer,
  TEST_DATABASE_URL,
  type RunningServer,
} from '../support/server'

const CONNECTIONS = Number(process.env.LOAD_CONNECTIONS ?? 200)
const SECONDS = Number(process.env.LOAD_SECONDS ?? 10)
const TARGETS = { pageP95Ms: 100, outlookRevalidationP95Ms: 150, errors: 0, peakRssMb: 400 }
/** What a browser sends: it accepts gzip (so the gzip copies of the page and the outlook are the ones measured). */
const BROWSER_ENCODING = 'gzip, deflate, br'

/** Peak resident memory of a process so far (VmHWM), in MB. */
function peakRssMb(pid: number) {
  const line = readFileSync(`/proc/${pid}/status`, 'utf8').split('\n').find(l => l.startsWith('VmHWM:'))
  return line ? Math.round(Number(line.replace(/\D+/g, '')) / 102.4) / 10 : null
}

async function sharedBriefing(server: RunningServer) {
  const planner = new ApiClient(server.url)
  await planner.signIn(PLANNER.email, PLANNER.password)
  const site = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick')
  const thresholdIds = (await planner.get(`/api/sites/${site.id}`)).body.thresholds.map((t: { id: string }) => t.id)
  const outlook = await planner.post(`/api/sites/${site.id}/outlooks`, {
    scenario: 'SSP2-4.5',
    samples: 20_000,
    wait: true,
  })
  if (outlook.status >= 300) throw new Error(`The outlook failed: ${outlook.status} ${JSON.stringify(outlook.body)}`)
  const draft = await planner.post('/api/briefings', {
    outlookId: outlook.body.id,
    comparisonOutlookIds: [],
    title: 'Kelwick: sea level to 2100 (load test)',
    audience: 'Harbour committee',
    localContext: 'Quay Street floods at spring tides.',
    language: 'en',
    units: 'm',
    thresholdIds,
    years: [2050, 2100],
  })
  if (draft.status !== 201) throw new Error(`The briefing failed: ${draft.status} ${JSON.stringify(draft.body)}`)
  await planner.post(`/api/briefings/${draft.body.id}/issue`)
  const { shareToken } = (await planner.post(`/api/briefings/${draft.body.id}/share`)).body
  const cookie = planner.cookieHeader()
  return { shareToken: shareToken as string, outlookId: outlook.body.id as string, cookie }
}

/** Runs one load; a response with any other status than `expected` counts as unexpected. */
function run(name: string, url: string, headers: Record<string, string> = {}, expected = 200) {
  return new Promise<Record<string, unknown>>((resolve, reject) => {
    // Every response time, so p95 is exact (autocannon's summary has p90 and p97.5 but no p95).
    const times: number[] = []
    let unexpected = 0
    const instance = autocannon({ url, connections: CONNECTIONS, duration: SECONDS, headers }, (error, result) => {
      if (error) return reject(error)
      times.sort((a, b) => a - b)
      const at = (p: number) =>
        Math.round((times[Math.min(times.length - 1, Math.ceil((p / 100) * times.length) - 1)] ?? NaN) * 10) / 10
      resolve({
        name, url: url.replace(/\/shared\/[\w-]+/, '/shared/<token>'), connections: CONNECTIONS, seconds: SECONDS,
        latencyMs: { p50: at(50), p95: at(95), p99: at(99), max: at(100) },
        requestsPerSecond: result.requests.average, requests: result.requests.total,
        expectedStatus: expected, unexpected, errors: result.errors, timeouts: result.timeouts,
      })
    })
    instance.on('response', (_client: unknown, status: number, _bytes: number, responseTime: number) => {
      times.push(responseTime)
      if (status !== expected) unexpected++
    })
  })
}

if (!existsSync(SERVER_ENTRY)) {
  console.error('No built server: run `npm run build` first.')
  process.exit(1)
}
// The database both servers share: a PGlite folder by default; with BRINKWATER_TEST_DATABASE_URL, a fresh
// database on that PostgreSQL server (the app process then holds no database engine of its own).
const postgres = TEST_DATABASE_URL ? await createTestDatabase() : undefined
const dataDir = postgres ? undefined : await mkdtemp(join(tmpdir(), 'brinkwater-load-'))
const databaseEnv: Record<string, string> = postgres ? { DATABASE_URL: postgres.url } : { PGLITE_DATA_DIR: dataDir! }
const setupServer = await startServer(databaseEnv)
let setup: Awaited<ReturnType<typeof sharedBriefing>>
let setupPeakRssMb: number | null
try {
  setup = await sharedBriefing(setupServer)
  setupPeakRssMb = peakRssMb(setupServer.pid)
}
finally {
  await setupServer.stop()
}
const server = await startServer(databaseEnv)
try {
  const { shareToken, outlookId, cookie } = setup
  // One request first (with the same headers as the run, which pick the cached copy), so the run
  // measures the page as readers meet it after the first one.
  const first = await fetch(`${server.url}/shared/${shareToken}`, {
    headers: { 'accept': 'text/html', 'accept-language': '' },
  })
  if (first.status !== 200) throw new Error(`The shared page answered ${first.status}`)
  await first.text()
  const page = await run('shared briefing page (anonymous HTML, gzip)', `${server.url}/shared/${shareToken}`, {
    'accept': 'text/html',
    'accept-encoding': BROWSER_ENCODING,
  })
  const pagePeakRssMb = peakRssMb(server.pid)
  const outlookUrl = `${server.url}/api/outlooks/${outlookId}`
  const reader = { cookie, 'accept': 'application/json', 'accept-encoding': BROWSER_ENCODING }
  const firstRead = await fetch(outlookUrl, { headers: reader })
  const etag = firstRead.headers.get('etag')
  if (firstRead.status !== 200 || !etag) throw new Error(`The outlook answered ${firstRead.status} with ETag ${etag}`)
  await firstRead.arrayBuffer()
  const revalidated = await run(
    'stored outlook revalidated (signed-in planner, If-None-Match: 304)',
    outlookUrl,
    { ...reader, 'if-none-match': etag },
    304,
  )
  const status = await run('outlook status (signed-in planner)', `${outlookUrl}/status`, reader)
  const fullRead = await run('stored outlook read in full (signed-in planner, gzip, no ETag)', outlookUrl, reader)
  const peak = peakRssMb(server.pid)
  const p95 = (r: Record<string, unknown>) => (r.latencyMs as { p95: number }).p95
  const results = [page, revalidated, status, fullRead]
  const errors = results.reduce(
    (sum, r) => sum + (r.errors as number) + (r.timeouts as number) + (r.unexpected as number),
    0,
  )
  console.log(
    JSON.stringify(
      {
        date: new Date().toISOString(),
        database: postgres ? 'postgresql' : 'pglite',
        node: process.version,
        serverNodeOptions: SERVER_NODE_OPTIONS.join(' '),
        cpus: cpus().length,
        cpu: cpus()[0]?.model,
        memoryGb: Math.round(totalmem() / 2 ** 30),
        loadAverage: loadavg().map(v => Math.round(v * 100) / 100),
        results,
        serverPeakRssMb: { afterPage: pagePeakRssMb, afterOutlookReads: peak, setupProcess: setupPeakRssMb },
        targets: TARGETS,
        met: {
          pageP95: p95(page) <= TARGETS.pageP95Ms,
          outlookRevalidationP95: p95(revalidated) <= TARGETS.outlookRevalidationP95Ms,
          errors: errors === TARGETS.errors,
          peakRss: peak !== null && peak <= TARGETS.peakRssMb,
        },
      },
      null,
      2,
    ),
  )
}
finally {
  await server.stop()
  if (dataDir) await rm(dataDir, { recursive: true, force: true })
  await postgres?.drop()
}
