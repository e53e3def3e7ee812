/**
 * A site of the reader's organisation. Another organisation's site answers 404 from the API, and
 * the page says the same (so ids do not leak).
 */
export async function useSite(id: string) {
  const fetched = await useFetch(`/api/sites/${id}`, { key: `site-${id}` })
  if (fetched.error.value || !fetched.data.value) {
    throw createError({
      statusCode: fetched.error.value?.statusCode ?? 404,
      statusMessage: 'No such site.',
      fatal: true,
    })
  }
  return fetched
}
