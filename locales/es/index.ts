import chance from './chance.json'
import document from './document.json'
import emails from './emails.json'
import uploads from './uploads.json'

// Spanish. The pages read PAGE_DOMAINS (../index.ts) through vue-i18n; the words below are said by
// server and client alike (e-mails, briefings and their PDFs, chances,
// what is wrong with an uploaded file) through shared/wording/translate.ts.
export default { code: 'es', language: 'es-ES', name: 'Español', words: { ...chance, ...document, ...emails, ...uploads } } as const
