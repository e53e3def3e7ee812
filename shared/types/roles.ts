import { LANGUAGES, type Language } from '../../locales'

// Roles and organisation kinds are shared by the schema, the guards and the UI.
// `operator` runs the instance (organisations, the demo mailbox); `admin` runs one organisation's people.
export const ROLES = ['operator', 'admin', 'analyst', 'planner', 'reader'] as const
export type Role = typeof ROLES[number]

export const ORGANISATION_KINDS = ['council', 'port', 'science', 'consultancy', 'other'] as const
export type OrganisationKind = typeof ORGANISATION_KINDS[number]

/** The languages of locales/index.ts: a person's pages and e-mails come in one of them. */
export const LOCALES = LANGUAGES.map(entry => entry.code)
export type LocaleCode = Language
