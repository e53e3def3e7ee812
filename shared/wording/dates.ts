// Dates are written day, month, year in English too: the product is British-style, and a council
// reading "3 December 2026" never wonders which number is the month.
const DATE_LOCALES: Record<string, string> = { en: 'en-GB' }

/** The Intl locale for dates and times in one of the app's languages. */
export function dateLocale(language: string): string {
  return DATE_LOCALES[language] ?? language
}
