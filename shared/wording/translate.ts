import { LANGUAGES, type Language } from '../../locales'

// The words that server and client both say (e-mails, briefings and their PDFs, chances), read from
// each language's folder beside the pages' own files, in the message syntax vue-i18n uses for those:
// `{name}` is replaced by a parameter, `{'…'}` is said as written, and "none | one | {n} many" (or
// "one | {n} many") chooses by the `count` or `n` parameter as vue-i18n's default rule does.

export type { Language }
export type WordParams = Record<string, string | number>

interface Words { [key: string]: string | string[] | Words }

export interface Translate {
  (key: string, params?: WordParams): string
  /** A list of sentences (a JSON array), each worded with the same parameters. */
  list: (key: string, params?: WordParams) => string[]
  language: Language
}

const catalogue = new Map<string, Words>(LANGUAGES.map(entry => [entry.code, entry.words as Words]))

function lookUp(words: Words | undefined, key: string): Words[string] | undefined {
  let node: Words[string] | undefined = words
  for (const part of key.split('.')) {
    if (!node || typeof node === 'string' || Array.isArray(node)) return undefined
    node = node[part]
  }
  return node
}

/** vue-i18n's default choice: with two forms 1 → first, otherwise second; with three 0, 1, more. */
function choose(forms: string[], count: number | undefined): string {
  const n = Math.abs(count ?? 1)
  const index = forms.length === 2 ? (n === 1 ? 0 : 1) : Math.min(n, 2)
  return forms[Math.min(index, forms.length - 1)]!
}

/** One message with its parameters: the plural form chosen, then each {name} replaced once. */
export function formatMessage(message: string, params: WordParams): string {
  const count = typeof params.count === 'number' ? params.count : typeof params.n === 'number' ? params.n : undefined
  const forms = message.split(/\s\|\s/)
  const chosen = forms.length > 1 ? choose(forms, count) : message
  return chosen.replace(
    /\{\s*(?:'([^']*)'|(\w+))\s*\}/g,
    (whole, literal: string | undefined, name: string | undefined) => {
      if (literal !== undefined) return literal
      const value = params[name!]
      if (value === undefined) throw new Error(`The words "${message}" need a value for {${name}}.`)
      return String(value)
    },
  )
}

const translators = new Map<Language, Translate>()

/** The words of one language; a key it lacks falls back to English, and one English lacks throws. */
export function translator(language: Language): Translate {
  const known = translators.get(language)
  if (known) return known
  const find = (key: string) => {
    const found = lookUp(catalogue.get(language), key) ?? lookUp(catalogue.get('en'), key)
    if (found === undefined || (typeof found === 'object' && !Array.isArray(found)))
      throw new Error(`No words for "${key}" in locales/${language}.`)
    return found
  }
  const t = ((key: string, params: WordParams = {}) => {
    const found = find(key)
    return formatMessage(Array.isArray(found) ? found.join(' ') : found, params)
  }) as Translate
  t.list = (key, params = {}) => {
    const found = find(key)
    return (Array.isArray(found) ? found : [found]).map(message => formatMessage(message, params))
  }
  t.language = language
  translators.set(language, t)
  return t
}

/** The app's language for a stored preference, a header or a page: English for anything else. */
export function languageOf(code: string | null | undefined): Language {
  return LANGUAGES.some(entry => entry.code === code) ? code as Language : 'en'
}

/** A group of fixed words as it stands (labels without parameters), e.g. a table's headings. */
export function wordsAt<T>(language: Language, key: string): T {
  const found = lookUp(catalogue.get(language), key) ?? lookUp(catalogue.get('en'), key)
  if (found === undefined) throw new Error(`No words for "${key}" in locales/${language}.`)
  return found as T
}

/** The BCP 47 tag a language's lists and dates are written in ("en-GB"). */
export function languageTag(language: Language): string {
  return LANGUAGES.find(entry => entry.code === language)?.language ?? language
}
