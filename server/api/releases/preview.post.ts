import { ReleaseContentSchema } from '#shared/schemas/releases'
import { buildRelease } from '#shared/releases/content'
import { previewYears, releaseBands } from '#shared/releases/summary'

// The editor's live preview: the bands the engine gives for what is entered so far. Saves nothing.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'analyst')
  const input = await readValidBody(event, ReleaseContentSchema)
  const release = asBadRequest(() => buildRelease(input))
  return { anchorYears: release.anchorYears, bands: releaseBands(release, previewYears(release)) }
})
