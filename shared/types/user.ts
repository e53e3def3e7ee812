import type { LocaleCode, Role } from './roles'

/** What the client may know about the signed-in user (kept in the session, refreshed from the database). */
export interface SessionUser {
  id: string
  email: string
  name: string
  role: Role
  organisationId: string
  organisationName: string
  organisationIllustrative: boolean
  locale: LocaleCode
}
