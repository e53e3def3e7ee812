import en from './en'
import es from './es'

// Every language the app speaks, each a folder of the same files. Adding one: copy a folder,
// translate every file, and add its line here; the app, the e-mails and the PDFs pick it up.
export const LANGUAGES = [en, es] as const

export type Language = typeof LANGUAGES[number]['code']

/** The files of a language folder that vue-i18n loads for the pages (locales/<code>/<domain>.json). */
export const PAGE_DOMAINS = ['app', 'sites', 'gauge', 'briefings', 'mail', 'pathways'] as const
