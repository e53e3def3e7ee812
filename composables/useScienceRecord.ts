import type { ReviewAction } from '#shared/review/rules'

/**
 * Science records reviewed on a library page of their own, with their API folder and the library list they appear in.
 */
const SCIENCE_RECORDS = {
  'storyline': { api: '/api/storylines', list: 'library-storylines' },
  'correlation-set': { api: '/api/correlation-sets', list: 'library-correlation-sets' },
  'scale-factor-grid': { api: '/api/scale-factor-grids', list: 'library-grids' },
} as const
export type ScienceRecordKind = keyof typeof SCIENCE_RECORDS

/** What the header of every science record's page shows of it, besides its title and subject. */
interface ReviewedRecord {
  id: string
  version: number
  state: string
  actions: ReviewAction[]
  withdrawalReason?: string | null
  reviewNote?: string | null
}

/**
 * A science record's detail page: the record (a missing or hidden one is the error page, as the API
 * answered), the props of its `<ScienceRecordHeader>` (`about` gives the title and subject line), and
 * what happens after a review action: a notice in the header saying what was done, and the record and
 * its library list fetched again.
 */
export async function useScienceRecord<Item extends ReviewedRecord>(
  kind: ScienceRecordKind,
  id: MaybeRefOrGetter<string>,
  about: (record: Item) => { title: string, subject: string },
) {
  const { t } = useI18n()
  const refreshData = useRefreshData()
  const { api, list } = SCIENCE_RECORDS[kind]
  const key = computed(() => `${kind}-${toValue(id)}`)
  const { data: record, error } = await useFetch<Item>(() => `${api}/${toValue(id)}`, { key })
  if (error.value)
    throw createError({ statusCode: error.value.statusCode ?? 500, message: error.value.statusMessage, fatal: true })
  const notice = ref('')

  async function reviewed(action: ReviewAction) {
    notice.value = t(`review.done.${action}`)
    await refreshData([key.value, list])
  }
  const header = computed(() => {
    // useFetch types the data of a generic Item as a Pick of it.
    const shown = record.value as Item | undefined
    if (!shown) return null
    const { version, state, actions, withdrawalReason, reviewNote } = shown
    const base = `${api}/${shown.id}`
    return { kind, ...about(shown), version, state, actions, withdrawalReason, reviewNote, base, notice: notice.value }
  })
  return { record, header, reviewed }
}
