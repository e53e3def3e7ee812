import { z } from 'zod'
import { emailField } from './users'

export const WatchRequestSchema = z
  .object({
    email: emailField,
    /** A site of the caller's organisation (signed in) … */
    siteId: z.uuid({ error: 'Choose a site.' }).optional(),
    /** … or the share link of a public briefing (anyone). */
    shareToken: z
      .string()
      .regex(/^[\w-]{20,64}$/, { error: 'This share link is not valid.' })
      .optional(),
    language: z.enum(['en', 'es'], { error: 'Choose English (en) or Spanish (es).' }).default('en'),
  })
  .refine(body => Boolean(body.siteId) !== Boolean(body.shareToken), {
    error: 'Send either siteId or shareToken.',
    path: ['siteId'],
  })

export const TokenSchema = z.object({
  token: z
    .string({ error: 'The link has no token.' })
    .regex(/^[\w-]{20,64}$/, { error: 'This link is not valid: copy the whole link from the e-mail.' }),
})
