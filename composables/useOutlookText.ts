import {
  beyondRange,
  chanceAfterDe,
  chanceAsOdds,
  EXTRAPOLATED_MARK,
  extrapolatedNote,
  formatChance,
  headlineSentence,
  likelihoodPhrase,
  type Language,
} from '#shared/wording/chance'
import { formatHeight, fromMetres } from '#shared/units'
import type { StoredOutlookNote } from '#shared/types/outlook-notes'
import { languageOf } from '#shared/wording/translate'

/**
 * Chances and heights for sites and outlooks in the reader's language and units. Every probability
 * on these pages goes through shared/wording/chance, so the page, briefings and PDFs say the same.
 */
export function useOutlookText() {
  const { t, locale } = useI18n()
  const preferences = usePreferencesStore()
  const language = computed<Language>(() => languageOf(locale.value))

  const chance = (probability: number) => formatChance(probability, language.value)
  const word = (probability: number) => likelihoodPhrase(probability, language.value)
  /**
   * The calibrated word, or none for a chance beyond the releases' outermost levels (they do not describe that tail).
   */
  const wordFor = (probability: number, extrapolated?: boolean) =>
    extrapolated ? beyondRange(language.value) : word(probability)
  const number = (value: number, digits = 1) =>
    value.toLocaleString(locale.value, { minimumFractionDigits: digits, maximumFractionDigits: digits })
  const dateTime = useDateTime()
  const component = (key: string) => (key === 'land-motion' ? t('outlook.landMotion') : t(`components.${key}`))

  return {
    language,
    height: (metres: number) => preferences.height(metres),
    /** A height a digit finer (millimetres), for gauge records and their fits. */
    fineHeight: (metres: number) => formatHeight(metres, preferences.units, locale.value, true),
    /** A height in the chosen unit as a bare number, for chart axes and CSV cells. */
    heightValue: (metres: number) => Math.round(fromMetres(metres, preferences.units) * 1000) / 1000,
    chance,
    word,
    odds: (probability: number) => chanceAsOdds(probability, language.value),
    /** "23 % (unlikely)"; an extrapolated chance gets the extrapolated mark instead of a word. */
    chanceWithWord: (probability: number, extrapolated?: boolean) =>
      `${chance(probability)} (${wordFor(probability, extrapolated)})`,
    /** The same after Spanish "de" ("es del 23 %", "es de menos del 1 %"); English needs no preposition. */
    ofChanceWithWord: (probability: number, extrapolated?: boolean) =>
      `${language.value === 'es' ? chanceAfterDe(probability) : chance(probability)} (${wordFor(probability, extrapolated)})`,
    /** A table cell: the value, with * when it rests on a release beyond its outermost level. */
    marked: (cell: string, extrapolated?: boolean) => (extrapolated ? `${cell} ${EXTRAPOLATED_MARK}` : cell),
    /** What * means, in the reader's language. */
    extrapolatedNote: computed(() => extrapolatedNote(language.value)),
    beyondRange: computed(() => beyondRange(language.value)),
    sentence: (parts: {
      probability: number
      standardError: number
      extrapolated?: boolean
      height: number
      year: number
      referenceLevel: string
    }) => headlineSentence({ ...parts, unit: preferences.units, language: language.value }),
    number,
    /** Land motion as typed, with its meaning: "−4.8 mm/yr (sinking)". */
    rate: (mmPerYear: number) => {
      const motion
        = mmPerYear < 0 ? t('sites.motion.sinking') : mmPerYear > 0 ? t('sites.motion.rising') : t('sites.motion.still')
      return `${number(mmPerYear, 1)} ${t('sites.units.mmPerYear')} (${motion})`
    },
    component,
    /** A note on how the outlook was put together, in the reader's language (older outlooks stored English text). */
    note: (note: StoredOutlookNote) => {
      if (typeof note === 'string') return note
      if (note.kind === 'unscaled')
        return t('outlook.notes.unscaled', { components: note.components.map(component).join(', ') })
      if (note.kind === 'uncorrelated') return t('outlook.notes.uncorrelated', { scenario: note.scenario })
      if (note.kind === 'correlation-other-series')
        return t('outlook.notes.correlationOtherSeries', { components: note.components.map(component).join(', ') })
      return t('outlook.notes.lifeBeyondReleases', { threshold: note.threshold, year: note.lastYear })
    },
    date: (value: string | Date | null | undefined) => dateTime(value) || '—',
  }
}
