import type { OutlookReleaseRef } from '#shared/types/outlook'
import { adoptedForReading } from '../services/adoptions'

/**
 * Since an outlook was computed: `new-version` a newer version in the series it used (still adopted),
 * `withdrawn` that series has no published version now, `adopted-other` the organisation has since
 * adopted another series for the component.
 */
export interface NewerScience {
  kind: 'new-version' | 'withdrawn' | 'adopted-other'
  component: string
  usedVersion: number
  latestVersion: number | null
  latestReleaseId: string | null
  seriesTitle: string | null
}

/** A published series the organisation has not adopted: offered, never applied by itself. */
export interface OfferedScience {
  component: string
  seriesId: string
  title: string
  organisationName: string
  version: number
}

/** What changed in the science an outlook used, and which other published series are on offer. */
export async function newerScience(
  organisationId: string,
  scenario: string,
  refs: OutlookReleaseRef[],
): Promise<{ newer: NewerScience[], offered: OfferedScience[] }> {
  const { adopted, published } = await adoptedForReading(`${organisationId}\n${scenario}`)
  const newer = refs.flatMap((ref): NewerScience[] => {
    const seriesId = adopted[ref.component] ?? ref.seriesId
    const now = published.find(row => row.seriesId === seriesId)
    const base = {
      component: ref.component,
      usedVersion: ref.version,
      latestVersion: now?.version ?? null,
      latestReleaseId: now?.releaseId ?? null,
      seriesTitle: now?.title ?? null,
    }
    if (seriesId !== ref.seriesId) return [{ kind: 'adopted-other', ...base }]
    if (!now) return [{ kind: 'withdrawn', ...base }]
    return now.releaseId === ref.releaseId ? [] : [{ kind: 'new-version', ...base }]
  })
  const offered = published
    .filter(
      row =>
        refs.some(ref => ref.component === row.component)
        && row.seriesId !== (adopted[row.component] ?? refs.find(ref => ref.component === row.component)!.seriesId),
    )
    .map(row => ({
      component: row.component,
      seriesId: row.seriesId,
      title: row.title,
      organisationName: row.organisationName,
      version: row.version,
    }))
  return { newer, offered }
}
