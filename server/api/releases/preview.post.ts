// The editor's live preview: the bands the engine gives for what is entered so far. Saves nothing.
// The body is parsed, checked against the shared schema and run through the engine on a worker
// within a time budget (server/utils/release-work.ts): a release as large as the limits allow
// never holds this thread.
export default defineEventHandler(async (event) => {
  await requireRole(event, 'analyst')
  return previewReleaseBody(await readJsonText(event))
})
