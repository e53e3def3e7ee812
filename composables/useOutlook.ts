import type { OutlookResult } from '#shared/engine'
import type { StoredOutlookNote } from '#shared/types/outlook-notes'

/** GET /api/outlooks/[id] as the page reads it (dates arrive as strings; the result is the engine's). */
export interface OutlookView {
  id: string
  siteId: string
  siteName: string
  referenceLevel: string
  scenario: string
  samples: number
  seed: number
  inputHash: string
  engineVersion: string
  state: 'running' | 'done' | 'failed'
  progress: number | null
  error: string | null
  notes: StoredOutlookNote[]
  releaseRefs: { component: string, releaseId: string, seriesId: string, version: number, citation: string, title: string, scale: number, scaleSource: string | null }[]
  input: {
    baselineYear: number
    landMotion: { rateMmPerYear: number, sigmaMmPerYear: number, epoch: number }
    thresholds: { key: string, height: number, kind?: 'mean-sea-level' | 'flood-level', designLifeYears?: number, lifeStartYear?: number }[]
    gumbel?: { location: number, scale: number }
    /** How the engine's heights (above mean sea level at the epoch) read above the datum; absent on outlooks stored before datums. */
    datum?: { name: string, kind: 'mean-sea-level' | 'land-survey' | 'chart', offset: number, referenceEpoch: number }
  }
  newerScience: { kind: 'new-version' | 'withdrawn' | 'adopted-other', component: string, usedVersion: number, latestVersion: number | null, latestReleaseId: string | null, seriesTitle: string | null }[]
  /** Published series of this scenario the organisation has not adopted: offered, not used. */
  offeredScience: { component: string, seriesId: string, title: string, organisationName: string, version: number }[]
  /** Published high-end storylines of the scenario at this site: beside the chances, never part of them (absent while running). */
  storylines?: { id: string, name: string, description: string, version: number, citation: string, organisationName: string, illustrative: boolean, rises: { year: number, rise: number }[] }[]
  durationMs: number | null
  createdAt: string
  finishedAt: string | null
  result: OutlookResult | null
}

/** The datum offset and reference epoch an outlook's heights are stated with. */
export function outlookDatum(outlook: Pick<OutlookView, 'input'>) {
  return { offset: outlook.input.datum?.offset ?? 0, referenceEpoch: outlook.input.datum?.referenceEpoch ?? outlook.input.baselineYear }
}

/** How often a running outlook is asked for its progress. */
const POLL_MS = 500

/**
 * One outlook, followed until it is done: while the server still computes it, the page asks again
 * every half second (the progress bar moves, and the charts appear when the run finishes).
 * Not async itself, so the lifecycle hooks are registered while the component is still current;
 * the caller awaits the returned fetch.
 */
export function useOutlook(id: string) {
  const fetched = useFetch<OutlookView>(`/api/outlooks/${id}`, { key: `outlook-${id}` })
  let timer: ReturnType<typeof setTimeout> | undefined

  function follow() {
    clearTimeout(timer)
    if (fetched.data.value?.state !== 'running') return
    timer = setTimeout(async () => {
      await fetched.refresh()
      follow()
    }, POLL_MS)
  }

  onMounted(follow)
  onBeforeUnmount(() => clearTimeout(timer))
  return fetched
}
