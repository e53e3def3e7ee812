import type { SessionUser } from './user'

// nuxt-auth-utils session shape: the cookie carries only a snapshot; guards re-read the database.
declare module '#auth-utils' {
  // eslint-disable-next-line @typescript-eslint/no-empty-object-type -- augmentation: the module's User becomes ours
  interface User extends SessionUser {}
  interface UserSession {
    /** The user's session generation at sign-in; once the database's has moved on, the session has ended. */
    generation?: number
  }
}

export {}
