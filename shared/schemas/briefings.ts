import { z } from 'zod'
import { HEIGHT_UNITS } from '../units'
import { textField } from './text'

// Issuing a briefing. Free text is stored as typed and always shown escaped.

const plain = (what: string, max: number) =>
  textField({ error: `Enter the ${what}.` }).max(max, { error: `Use at most ${max} characters.` })

/** A briefing that lists a year or a threshold twice repeats its numbers: each is chosen once. */
const unique = (list: unknown[]) => new Set(list).size === list.length

const BriefingFields = {
  title: plain('title', 160).trim().min(1, { error: 'Enter a title, like "Quay Street: sea level to 2100".' }),
  audience: plain('audience note', 500).default(''),
  localContext: plain('local context', 4000).default(''),
  language: z.enum(['en', 'es'], { error: 'Choose English (en) or Spanish (es).' }).default('en'),
  units: z.enum(HEIGHT_UNITS as ['m', 'ft'], { error: 'Choose metres (m) or feet (ft).' }).default('m'),
  thresholdIds: z
    .array(z.uuid({ error: 'Choose thresholds of this site.' }), { error: 'Send the thresholds as a list of ids.' })
    .min(1, { error: 'Choose at least one threshold.' })
    .max(12)
    .refine(unique, { error: 'Choose each threshold once.' }),
  years: z
    .array(
      z
        .number({ error: 'Choose whole years from the outlook.' })
        .int({ error: 'Choose whole years from the outlook.' }),
      { error: 'Send the years as a list.' },
    )
    .min(1, { error: 'Choose at least one year.' })
    .max(8, { error: 'Choose at most 8 years.' })
    .refine(unique, { error: 'Choose each year once.' }),
  /** The site's adaptation pathways and decision records as a section of their own, frozen when issued. */
  includePathways: z.boolean({ error: 'includePathways must be true or false.' }).default(false),
  /** Outlooks of other scenarios at the same site, compared in the table. */
  comparisonOutlookIds: z
    .array(z.uuid({ error: 'Choose outlooks of this site to compare.' }), {
      error: 'Send the outlooks to compare as a list of ids.',
    })
    .max(4, { error: 'Compare at most 4 other scenarios.' })
    .refine(unique, { error: 'Compare each outlook once.' })
    .default([]),
}

export const CreateBriefingSchema = z.object({
  outlookId: z.uuid({ error: 'Choose the outlook to issue the briefing from.' }),
  ...BriefingFields,
})
export const UpdateBriefingSchema = z.object(BriefingFields)

export type CreateBriefingInput = z.infer<typeof CreateBriefingSchema>
export type UpdateBriefingInput = z.infer<typeof UpdateBriefingSchema>

/** A new version of an issued briefing: as it was, or from the latest finished outlooks of its scenarios. */
export const NewVersionSchema = z.object({
  fromLatestOutlooks: z.boolean({ error: 'fromLatestOutlooks must be true or false.' }).default(false),
}, { error: 'Send { fromLatestOutlooks: true } to start from the latest outlooks, or no body.' })
export type NewVersionInput = z.infer<typeof NewVersionSchema>
