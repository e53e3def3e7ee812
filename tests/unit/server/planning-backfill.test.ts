import { readdirSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { LeanPGlite } from '../../../server/db/pglite-client'

// Migration 0010 gives every site a planning scenario. Sites that existed before it keep the
// scenario their planners ran most (SSP2-4.5 first on a tie); sites without a finished outlook
// plan for SSP2-4.5. Checked by applying the migrations in order on an empty PGlite.

const FOLDER = resolve(import.meta.dirname, '../../../server/db/migrations')
const files = readdirSync(FOLDER).filter(name => name.endsWith('.sql')).sort()
const planning = files.findIndex(name => name.includes('site_planning_scenario'))
const apply = async (client: LeanPGlite, name: string) => {
  for (const statement of readFileSync(resolve(FOLDER, name), 'utf8').split('--> statement-breakpoint')) {
    if (statement.trim()) await client.exec(statement)
  }
}

let client: LeanPGlite
beforeAll(async () => { client = await LeanPGlite.open({}) }, 60_000)
afterAll(async () => { await client.close() })

describe('the planning scenario backfill', () => {
  it('keeps each existing site on the scenario it ran most, and SSP2-4.5 otherwise', async () => {
    for (const name of files.slice(0, planning)) await apply(client, name)
    await client.exec(`
      insert into organisations (id, name, kind) values ('00000000-0000-4000-8000-000000000001', 'Council', 'council');
      insert into users (id, email, name, password_hash, role, organisation_id) values ('00000000-0000-4000-8000-000000000002', 'p@example.org', 'P', 'x', 'planner', '00000000-0000-4000-8000-000000000001');
    `)
    const site = (
      n: number,
      name: string,
    ) => `insert into sites (id, organisation_id, name, latitude, longitude, reference_level, datum_kind, datum_offset, reference_epoch, land_motion_rate, land_motion_sigma, land_motion_source, land_motion_epoch, created_by)
      values ('00000000-0000-4000-8000-00000000010${n}', '00000000-0000-4000-8000-000000000001', '${name}', 47, -34, 'MSL', 'mean-sea-level', 0, 2020, 0, 0.5, 'gps', 2020, '00000000-0000-4000-8000-000000000002');`
    const outlook = (
      n: number,
      scenario: string,
      hash: string,
      state = 'done',
    ) => `insert into outlooks (site_id, scenario, samples, seed, input_hash, engine_version, state, input, release_refs, finished_at)
      values ('00000000-0000-4000-8000-00000000010${n}', '${scenario}', 1000, 1, '${hash}', 'test', '${state}', '{}', '[]', now());`
    await client.exec([
      site(1, 'High twice'), outlook(1, 'SSP5-8.5', 'a'), outlook(1, 'SSP5-8.5', 'b'), outlook(1, 'SSP2-4.5', 'c'),
      site(2, 'Tie'), outlook(2, 'SSP5-8.5', 'd'), outlook(2, 'SSP2-4.5', 'e'),
      site(3, 'None yet'),
      site(4, 'Only failed'), outlook(4, 'SSP1-2.6', 'f', 'failed'),
      site(5, 'Storyline'), outlook(5, 'high-end-ice', 'g'),
    ].join('\n'))
    await apply(client, files[planning]!)
    const rows = (
      await client.query<{ name: string, planning_scenario: string, planning_tolerance: number }>(
        'select name, planning_scenario, planning_tolerance from sites order by name',
        [],
        { rowMode: 'object' },
      )
    ).rows
    expect(rows).toEqual([
      { name: 'High twice', planning_scenario: 'SSP5-8.5', planning_tolerance: 0.1 },
      { name: 'None yet', planning_scenario: 'SSP2-4.5', planning_tolerance: 0.1 },
      { name: 'Only failed', planning_scenario: 'SSP2-4.5', planning_tolerance: 0.1 },
      { name: 'Storyline', planning_scenario: 'high-end-ice', planning_tolerance: 0.1 },
      { name: 'Tie', planning_scenario: 'SSP2-4.5', planning_tolerance: 0.1 },
    ])
  })
})
