import type { InternalApi } from 'nitropack/types'

/** GET /api/outlooks/[id] as the page receives it: the stored outlook (dates arrive as strings). */
export type OutlookView = InternalApi['/api/outlooks/:id']['get']
/** GET /api/outlooks/[id]/status: what changes while the outlook is read (progress, site name, science, storylines). */
export type OutlookStatus = InternalApi['/api/outlooks/:id/status']['get']

/** The datum offset and reference epoch an outlook's heights are stated with. */
export function outlookDatum(outlook: Pick<OutlookView, 'input'>) {
  return {
    offset: outlook.input.datum?.offset ?? 0,
    referenceEpoch: outlook.input.datum?.referenceEpoch ?? outlook.input.baselineYear,
  }
}

/** How often a running outlook is asked for its progress. */
const POLL_MS = 500

/**
 * One outlook and its status, followed until it is done: while the server still computes it, the page
 * asks for the status every half second (the progress bar moves), and reads the stored outlook again
 * once it has finished (the charts appear). A finished outlook is read once; the browser keeps it and
 * revalidates it with its ETag. Not async itself, so the lifecycle hooks are registered while the
 * component is still current; the caller awaits the returned promise.
 */
export function useOutlook(id: string) {
  const stored = useFetch(`/api/outlooks/${id}`, { key: `outlook-${id}` })
  const status = useFetch(`/api/outlooks/${id}/status`, { key: `outlook-status-${id}` })
  let timer: ReturnType<typeof setTimeout> | undefined

  function follow() {
    clearTimeout(timer)
    if (status.data.value?.state === 'running') {
      timer = setTimeout(async () => {
        await status.refresh()
        follow()
      }, POLL_MS)
      return
    }
    // It finished while followed (or between the two reads): the stored outlook now has its result.
    if (stored.data.value?.state === 'running' && status.data.value) stored.refresh()
  }

  onMounted(follow)
  onBeforeUnmount(() => clearTimeout(timer))
  return Promise.all([stored, status]).then(() => ({
    outlook: stored.data,
    status: status.data,
    error: computed(() => stored.error.value ?? status.error.value),
  }))
}
