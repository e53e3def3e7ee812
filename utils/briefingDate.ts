import { dateLocale } from '#shared/wording/dates'

/** The date of issue as the document writes it: in the briefing's language, as the PDF does. */
export function briefingDate(iso: string | null, language: string) {
  // UTC on both sides, so the server-rendered page and the hydrated one agree.
  return iso ? new Date(iso).toLocaleDateString(dateLocale(language), { dateStyle: 'long', timeZone: 'UTC' }) : null
}
