import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { types } from '@electric-sql/pglite'
import { LeanPGlite } from '../../../server/db/pglite-client'

// The lean client must answer exactly as PGlite does with the parsers drizzle sends (dates, timestamps,
// intervals and numeric or date-time arrays as text), with or without those parsers on the query.
const DRIZZLE_PARSERS = Object.fromEntries(
  [types.TIMESTAMP, types.TIMESTAMPTZ, types.INTERVAL, types.DATE, 1231, 1115, 1185, 1187, 1182].map(type => [
    type,
    (value: string) => value,
  ]),
)
const ROW = `select timestamptz '2026-12-02 03:04:05+00' as at, date '2026-12-02' as day, interval '90 minutes' as span,
  array[1.5, 2.25]::numeric[] as levels, array[timestamp '2026-01-01 00:00']::timestamp[] as stamps,
  42::int4 as whole, 0.5::float8 as half, '{"a":1}'::jsonb as doc, true as flag`

let client: LeanPGlite
beforeAll(async () => { client = await LeanPGlite.open({}) }, 60_000)
afterAll(async () => { await client.close() })

describe('LeanPGlite (drizzle\'s text parsers installed once)', () => {
  it('gives the same row with drizzle\'s per-query parsers as without them', async () => {
    const withParsers = await client.query(ROW, [], { rowMode: 'object', parsers: DRIZZLE_PARSERS })
    const without = await client.query(ROW, [], { rowMode: 'object' })
    expect(withParsers.rows).toEqual(without.rows)
    expect(without.rows[0]).toEqual({
      at: '2026-12-02 03:04:05+00', day: '2026-12-02', span: '01:30:00',
      levels: '{1.5,2.25}', stamps: '{"2026-01-01 00:00:00"}',
      whole: 42, half: 0.5, doc: { a: 1 }, flag: true,
    })
  })

  it('keeps a query\'s own parser when it brings one the client has not installed', async () => {
    const result = await client.query<{ whole: string }>('select 42::int4 as whole', [], {
      parsers: { [types.INT4]: (value: string) => `#${value}` },
    })
    expect(result.rows[0]!.whole).toBe('#42')
  })

  it('treats queries inside a transaction the same way, and still rolls back', async () => {
    await client.exec('create table notes (body text)')
    const inside = await client.transaction(async (tx) => {
      await tx.query('insert into notes values ($1)', ['kept'])
      return (await tx.query(ROW, [], { rowMode: 'object', parsers: DRIZZLE_PARSERS })).rows[0]
    })
    expect(inside).toMatchObject({ at: '2026-12-02 03:04:05+00', levels: '{1.5,2.25}' })
    await client.transaction(async (tx) => {
      await tx.query('insert into notes values ($1)', ['dropped'])
      await tx.rollback()
    })
    expect((await client.query('select body from notes')).rows).toEqual([{ body: 'kept' }])
  })

  it('keeps the text parsers after PGlite rebuilds its array parsers', async () => {
    await client.refreshArrayTypes()
    expect((await client.query(ROW)).rows[0]).toMatchObject({
      stamps: '{"2026-01-01 00:00:00"}',
      at: '2026-12-02 03:04:05+00',
    })
  })
})
