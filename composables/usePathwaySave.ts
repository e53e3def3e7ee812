/**
 * Saving a site's measure or pathway from its form: a new one is POSTed to the collection, an edited one
 * (`editingId`) PATCHed at its own address; on success the pathways page's data is refreshed. The
 * form's working/error state is `useSubmit`'s.
 */
export function usePathwaySave(siteId: string, collection: 'measures' | 'pathways', editingId?: string) {
  const submit = useSubmit()
  const refreshData = useRefreshData()
  // A plain string: the typed route lookup of a template literal here exceeds the type checker's depth.
  const endpoint: string = `/api/sites/${siteId}/${collection}${editingId ? `/${editingId}` : ''}`
  const method = editingId ? 'PATCH' : 'POST'

  /** Resolves true once saved and refreshed; false when the refusal is shown. */
  async function save(body: Record<string, unknown>) {
    if (!(await submit.run(() => $fetch<unknown, string>(endpoint, { method, body })))) return false
    await refreshData(`pathways-${siteId}`)
    return true
  }
  return { ...submit, save }
}
