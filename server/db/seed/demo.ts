import { count } from 'drizzle-orm'
import type { Role } from '../../../shared/types/roles'
import type { Database } from '../client'
import { auditLog, organisations, users } from '../schema'
import { seedScience } from './science'
import { seedSites } from './sites'
import { seedPathways } from './pathways'

// An invented stretch of coast. Every name, organisation and person here is fictional and
// illustrative; the README lists the demo passwords, which are for the demo only.
export const DEMO_COAST = 'Caldwyn Coast'

export const DEMO_ORGANISATIONS = [
  { key: 'council', name: 'Caldwyn Coast Regional Council', kind: 'council' },
  { key: 'port', name: 'Skerrow Harbour Board', kind: 'port' },
  { key: 'science', name: 'Saltglass Ice and Ocean Group', kind: 'science' },
] as const

type DemoOrgKey = typeof DEMO_ORGANISATIONS[number]['key']

export const DEMO_USERS: ReadonlyArray<{
  email: string
  name: string
  role: Role
  org: DemoOrgKey
  password: string
  locale?: 'en' | 'es'
}> = [
  // Runs the demo instance (every organisation's people, the demo mailbox); belongs to the council only
  // because every account belongs to one.
  {
    email: 'operator@caldwyn.example',
    name: 'Cadan Rowe',
    role: 'operator',
    org: 'council',
    password: 'demo-operator-tide',
  },
  { email: 'admin@caldwyn.example', name: 'Morwen Tallis', role: 'admin', org: 'council', password: 'demo-admin-tide' },
  {
    email: 'analyst@saltglass.example',
    name: 'Ivo Brannock',
    role: 'analyst',
    org: 'science',
    password: 'demo-analyst-tide',
  },
  {
    email: 'reviewer@saltglass.example',
    name: 'Petra Lusk',
    role: 'analyst',
    org: 'science',
    password: 'demo-reviewer-tide',
  },
  {
    email: 'planner@caldwyn.example',
    name: 'Noor Halloran',
    role: 'planner',
    org: 'council',
    password: 'demo-planner-tide',
  },
  {
    email: 'planner@skerrow.example',
    name: 'Tomas Greer',
    role: 'planner',
    org: 'port',
    password: 'demo-port-tide',
    locale: 'es',
  },
  { email: 'reader@caldwyn.example', name: 'Elin Marsh', role: 'reader', org: 'council', password: 'demo-reader-tide' },
]

export async function isEmpty(db: Database) {
  const [row] = await db.select({ n: count() }).from(organisations)
  return (row?.n ?? 0) === 0
}

/** Writes the demo coast into an empty database, all in one transaction. */
export async function seedDemo(db: Database, hash: (password: string) => Promise<string>) {
  const hashes = await Promise.all(DEMO_USERS.map(user => hash(user.password)))
  await db.transaction(async (tx) => {
    const orgIds = new Map<DemoOrgKey, string>()
    for (const org of DEMO_ORGANISATIONS) {
      const [row] = await tx.insert(organisations)
        .values({ name: org.name, kind: org.kind, illustrative: true })
        .returning({ id: organisations.id })
      orgIds.set(org.key, row!.id)
    }
    const people = await tx.insert(users).values(DEMO_USERS.map((user, i) => ({
      email: user.email,
      name: user.name,
      role: user.role,
      organisationId: orgIds.get(user.org)!,
      passwordHash: hashes[i]!,
      locale: user.locale ?? 'en',
    }))).returning({ id: users.id, email: users.email })
    const idOf = (email: string) => people.find(person => person.email === email)!.id
    await seedScience(tx, {
      organisationId: orgIds.get('science')!,
      authorId: idOf('analyst@saltglass.example'),
      reviewerId: idOf('reviewer@saltglass.example'),
    })
    await seedSites(tx, {
      council: { org: orgIds.get('council')!, planner: idOf('planner@caldwyn.example') },
      port: { org: orgIds.get('port')!, planner: idOf('planner@skerrow.example') },
    })
    await seedPathways(tx, idOf('planner@caldwyn.example'))
    await tx.insert(auditLog).values({ action: 'demo.seeded', targetType: 'database', detail: { coast: DEMO_COAST } })
  })
}
