import { eq } from 'drizzle-orm'
import type { Database } from '../client'
import { adaptationMeasures, adaptationPathways, sites } from '../schema'

// One invented pathway on the demo coast, labelled illustrative wherever it is shown. Heights are
// metres above Kelwick's datum (its mean sea level at the reference epoch).
const KELWICK_MEASURES = [
  { key: 'wall', name: 'Today\'s quay wall', height: 0.35, leadTimeYears: 0, designLifeYears: null, costBand: null },
  {
    key: 'raise',
    name: 'Raise the quay wall by 0.4 m',
    height: 0.75,
    leadTimeYears: 12,
    designLifeYears: 50,
    costBand: 'medium',
  },
  {
    key: 'barrier',
    name: 'Tidal barrier at the harbour mouth',
    height: 1.4,
    leadTimeYears: 25,
    designLifeYears: 100,
    costBand: 'very-high',
  },
  {
    key: 'retreat',
    name: 'Managed retreat from the quay district',
    height: null,
    leadTimeYears: 30,
    designLifeYears: null,
    costBand: 'high',
  },
] as const

export async function seedPathways(tx: Pick<Database, 'insert' | 'select'>, planner: string) {
  const [kelwick] = await tx.select({ id: sites.id }).from(sites).where(eq(sites.name, 'Kelwick'))
  if (!kelwick) return
  // Lists show measures in the order they were made; rows inserted in one statement share the
  // transaction's clock, so each gets its own second to keep the list in the order written here.
  const madeFrom = Date.now() - KELWICK_MEASURES.length * 1000
  const measures = await tx
    .insert(adaptationMeasures)
    .values(
      KELWICK_MEASURES.map(({ key: _key, ...m }, index) => ({
        ...m,
        siteId: kelwick.id,
        kind: 'mean-sea-level' as const,
        createdBy: planner,
        createdAt: new Date(madeFrom + index * 1000),
      })),
    )
    .returning({ id: adaptationMeasures.id })
  await tx.insert(adaptationPathways).values({
    siteId: kelwick.id, name: 'Quay district: hold the line, then retreat', measureIds: measures.map(m => m.id),
    tolerances: [0.1, 0.5], illustrative: true, createdBy: planner,
  })
}
