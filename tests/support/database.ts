import { randomBytes } from 'node:crypto'
import pg from 'pg'

// With BRINKWATER_TEST_DATABASE_URL (a superuser URL to a PostgreSQL server), every test server
// gets a database of its own on that server, created here with a random name and dropped after.

export const TEST_DATABASE_URL = process.env.BRINKWATER_TEST_DATABASE_URL || undefined

export interface TestDatabase {
  /** DATABASE_URL for the app. */
  url: string
  name: string
  /** Drops the database, closing any connection still open to it. */
  drop: () => Promise<void>
}

async function asAdmin<T>(adminUrl: string, work: (client: pg.Client) => Promise<T>) {
  const client = new pg.Client({ connectionString: adminUrl })
  await client.connect()
  try {
    return await work(client)
  }
  finally {
    await client.end()
  }
}

/** A fresh, empty database on the test server; the app migrates and seeds it when it starts. */
export async function createTestDatabase(adminUrl = TEST_DATABASE_URL): Promise<TestDatabase> {
  if (!adminUrl)
    throw new Error('Set BRINKWATER_TEST_DATABASE_URL to a PostgreSQL superuser URL to create test databases.')
  const name = `brinkwater_test_${randomBytes(6).toString('hex')}`
  await asAdmin(adminUrl, client => client.query(`create database ${name}`))
  const url = new URL(adminUrl)
  url.pathname = `/${name}`
  let dropped = false
  return {
    url: url.toString(),
    name,
    async drop() {
      if (dropped) return
      dropped = true
      await asAdmin(adminUrl, client => client.query(`drop database if exists ${name} with (force)`))
    },
  }
}
