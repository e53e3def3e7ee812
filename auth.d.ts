import type { SessionUser } from './shared/types/user'

// nuxt-auth-utils session shape: the cookie carries only a snapshot; guards re-read the database.
declare module '#auth-utils' {
  interface User extends SessionUser {}
}

export {}
