import { z } from 'zod'

// Route parameters (the bracketed parts of a path under server/api, read with readValidParams) and
// the query parameters several routes share.

/** `[id]`: every record is named by a uuid. */
export const IdParams = z.object({ id: z.uuid() })

/** `[token]`: a briefing's share link. */
export const ShareTokenParams = z.object({ token: z.string().regex(/^[\w-]{20,64}$/) })

/** `?limit=`: how many of the newest lines a list shows, from 1 to `max`. */
export function LimitQuery(max: number, fallback: number) {
  const error = `Use a whole number from 1 to ${max}.`
  return z.object({
    limit: z.coerce.number({ error }).int({ error }).min(1, { error }).max(max, { error }).default(fallback),
  })
}
