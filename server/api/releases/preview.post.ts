import { ReleaseContentSchema } from '#shared/schemas/releases'

// The editor's live preview: the bands the engine gives for what is entered so far. Saves nothing.
// The engine runs on a worker within a time budget (server/utils/release-work.ts), never on this thread.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'analyst')
  const input = await readValidBody(event, ReleaseContentSchema)
  const { release, bands } = await releaseWork({ input, years: 'preview' })
  return { anchorYears: release.anchorYears, bands }
})
