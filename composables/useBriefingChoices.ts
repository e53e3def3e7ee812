import type { ApiResponse } from '~/utils/apiResponse'

/**
 * The outlook a briefing is issued from and its site, as the issue form needs them. One
 * useAsyncData for both (the site is known only from the outlook), with the request's cookies
 * forwarded during server rendering. A missing or unfinished outlook is shown, not thrown.
 */
export async function useBriefingChoices(outlookId: string) {
  const requestFetch = useRequestFetch()
  const { data, error } = await useAsyncData(`briefing-choices-${outlookId}`, async () => {
    const outlook = await requestFetch(`/api/outlooks/${outlookId}`)
    const site = await requestFetch<ApiResponse<'/api/sites/:id'>>(`/api/sites/${outlook.siteId}`)
    // Only what the form needs travels in the page payload, not the whole result.
    return {
      outlook: {
        id: outlook.id,
        siteId: outlook.siteId,
        scenario: outlook.scenario,
        state: outlook.state,
        years: outlook.result?.years ?? [],
      },
      site,
    }
  })
  const outlook = computed(() => data.value?.outlook ?? null)
  const site = computed(() => data.value?.site ?? null)

  const choices = computed<BriefingFormChoices | null>(() => {
    if (!outlook.value || outlook.value.state !== 'done' || !site.value) return null
    const primary = outlook.value.scenario
    // Newest first from the API: keep the first finished outlook of each other scenario.
    const seen = new Set<string>([primary])
    const comparisons = site.value.outlooks.filter((o) => {
      if (o.state !== 'done' || seen.has(o.scenario)) return false
      seen.add(o.scenario)
      return true
    })
    return {
      thresholds: site.value.thresholds,
      years: outlook.value.years,
      comparisons,
      pathways: site.value.pathwayCounts,
    }
  })
  return { outlook, site, error, choices }
}
