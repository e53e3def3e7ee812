import { DEMO_USERS } from '../../server/db/seed/demo'

/** The seeded demo account for a role (the first one, where a role has several). */
export function demoUser(email: string) {
  const user = DEMO_USERS.find(candidate => candidate.email === email)
  if (!user) throw new Error(`No demo user ${email}`)
  return user
}

export const OPERATOR = demoUser('operator@caldwyn.example')
export const ADMIN = demoUser('admin@caldwyn.example')
export const ANALYST = demoUser('analyst@saltglass.example')
export const PLANNER = demoUser('planner@caldwyn.example')
export const PORT_PLANNER = demoUser('planner@skerrow.example')
export const READER = demoUser('reader@caldwyn.example')
