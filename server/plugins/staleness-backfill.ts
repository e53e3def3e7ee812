import { backfillStaleness } from '~~/server/services/briefing-staleness'

// Briefings issued before staleness was stored have none; work it out once, in the background after
// start, so an overtaken briefing says so from the first read rather than after its site's next outlook.
export default defineNitroPlugin(() => {
  backfillStaleness()
    .then((count) => {
      if (count) console.info(`[brinkwater] Worked out whether ${count} issued briefings are out of date.`)
    })
    .catch(error =>
      console.error('[brinkwater] Briefing staleness was not worked out:', error instanceof Error ? error.message : error),
    )
})
