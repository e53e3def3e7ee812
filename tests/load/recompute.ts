// `npm run load:recompute`: a recomputation at scale. The built server on loopback (in-memory
// database) gets RECOMPUTE_SITES sites (300) with an outlook of RECOMPUTE_SAMPLES samples (100,000)
// each; then a new release is published and the recomputation it queues is followed through the
// operator's API until every site is done. Prints JSON: wall times, throughput, server peak RSS, and the
// progress the recomputations page showed along the way. Build first (`npm run build`).
import { existsSync, readFileSync } from 'node:fs'
import { cpus, loadavg } from 'node:os'
import { setTimeout as delay } from 'node:timers/promises'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, demoUser } from '../support/demo-users'
import { SERVER_ENTRY, startServer } from '../support/server'

const SITES = Number(process.env.RECOMPUTE_SITES ?? 300)
const SAMPLES = Number(process.env.RECOMPUTE_SAMPLES ?? 100_000)
const SCENARIO = 'SSP2-4.5'
const POLL_MS = 1000

function peakRssMb(pid: number) {
  const line = readFileSync(`/proc/${pid}/status`, 'utf8').split('\n').find(l => l.startsWith('VmHWM:'))
  return line ? Math.round(Number(line.replace(/\D+/g, '')) / 102.4) / 10 : null
}

/** Sites spread over the invented coast, each with its own land motion and one threshold. */
function site(i: number) {
  return {
    name: `Scale test point ${i + 1}`,
    latitude: 47.2 + (i % 20) * 0.08,
    longitude: -35.5 + Math.floor(i / 20) * 0.2,
    referenceLevel: 'Mean sea level 2020 (load test)',
    datum: { kind: 'mean-sea-level', offset: 0 },
    referenceEpoch: 2020,
    landMotion: {
      rateMmPerYear: -3 + (i % 7),
      sigmaMmPerYear: 0.5,
      source: 'gps',
      reference: 'Load test',
      epoch: 2020,
    },
    thresholds: [{ label: 'Quay', height: 0.6 + (i % 5) * 0.1 }],
  }
}

async function main() {
  if (!existsSync(SERVER_ENTRY)) throw new Error('No built server: run `npm run build` first.')
  // The first run queues every site's outlook at once, so the organisation's quota is lifted to match.
  const server = await startServer({ JOBS_POLL_MS: '200', OUTLOOK_QUEUE_PER_ORGANISATION: String(SITES) })
  try {
    const url = server.url
    const planner = await ApiClient.signedIn(url, PLANNER.email, PLANNER.password)
    const admin = await ApiClient.signedIn(url, OPERATOR.email, OPERATOR.password)
    const ids: string[] = []
    for (let i = 0; i < SITES; i++) {
      const created = await planner.post('/api/sites', site(i))
      if (created.status !== 201) throw new Error(`Site ${i + 1}: ${created.status} ${JSON.stringify(created.body)}`)
      ids.push(created.body.id)
    }
    console.error(`created ${SITES} sites`)
    const waiting = async () => (await admin.get('/api/admin/recomputations')).body.outlooksWaiting as number
    let started = performance.now()
    for (const id of ids)
      await planner.post(`/api/sites/${id}/outlooks`, { scenario: SCENARIO, samples: SAMPLES, seed: 1, wait: false })
    console.error(`queued ${SITES} outlooks after ${Math.round(performance.now() - started)} ms`)
    for (let left = await waiting(); left > 0; left = await waiting()) {
      console.error(`${left} outlooks still to compute`)
      await delay(POLL_MS)
    }
    const firstRunMs = performance.now() - started

    const analyst = await ApiClient.signedIn(url, ANALYST.email, ANALYST.password)
    const reviewerUser = demoUser('reviewer@saltglass.example')
    const reviewer = await ApiClient.signedIn(url, reviewerUser.email, reviewerUser.password)
    const [glaciers] = (await analyst.get(`/api/releases?component=glaciers&scenario=${SCENARIO}&state=published`)).body
    const next = await analyst.post('/api/releases', {
      seriesId: glaciers.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.07, 0.13, 0.18],
      sd: [0.01, 0.03, 0.04],
      method: 'Load test',
      citation: 'Load test',
      licence: 'CC BY 4.0',
    })
    await analyst.post(`/api/releases/${next.body.id}/submit`)
    started = performance.now()
    await reviewer.post(`/api/releases/${next.body.id}/approve`)
    const progress: Array<{ seconds: number, sitesDone: number, of: number }> = []
    let batch: { siteCount: number, done: number, failed: number, finishedAt: string | null } | undefined
    do {
      await delay(POLL_MS)
      batch = (await admin.get('/api/admin/recomputations')).body.recomputations.find(
        (r: { scenario: string }) => r.scenario === SCENARIO,
      )
      if (batch)
        progress.push({
          seconds: Math.round((performance.now() - started) / 100) / 10,
          sitesDone: batch.done + batch.failed,
          of: batch.siteCount,
        })
    } while (!batch?.finishedAt)
    const recomputeMs = performance.now() - started

    console.log(
      JSON.stringify(
        {
          date: new Date().toISOString(),
          machine: {
            cpus: cpus().length,
            model: cpus()[0]?.model,
            node: process.version,
            loadAverage: loadavg().map(x => +x.toFixed(2)),
          },
          sites: SITES,
          samples: SAMPLES,
          scenario: SCENARIO,
          firstOutlooks: { seconds: +(firstRunMs / 1000).toFixed(1), perSiteMs: Math.round(firstRunMs / SITES) },
          recomputation: {
            seconds: +(recomputeMs / 1000).toFixed(1),
            perSiteMs: Math.round(recomputeMs / SITES),
            done: batch.done,
            failed: batch.failed,
          },
          progressSeen: progress.filter(
            (_, i) => i % Math.max(1, Math.floor(progress.length / 10)) === 0 || i === progress.length - 1,
          ),
          serverPeakRssMb: peakRssMb(server.pid),
        },
        null,
        2,
      ),
    )
  }
  finally {
    await server.stop()
  }
}

await main()
