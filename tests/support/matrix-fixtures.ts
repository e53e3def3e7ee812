import { expect } from 'vitest'
import { ApiClient } from './client'
import { ADMIN, ANALYST, OPERATOR, PLANNER, PORT_PLANNER, READER, demoUser } from './demo-users'

// The people and records the authorisation matrix asks about. Everyone the matrix signs in as
// belongs to one home organisation (the Caldwyn council); every "other organisation" record
// belongs to the Skerrow harbour board (sites, outlooks, briefings, watches) or the Saltglass
// science group (drafts of releases, correlation sets and grids).

export const PERSONAS = ['anonymous', 'reader', 'planner', 'analyst', 'admin', 'operator'] as const
export type Persona = typeof PERSONAS[number]

/** A marker written into every private record of the other organisations: it must never come back. */
export const FOREIGN_MARKER = 'FOREIGN-PRIVATE-7Q'

const PASSWORD = 'Matrix-harbour-gauge-42'
/** A person of another organisation: their admins see them, the home organisation's admin must not. */
const FOREIGN_PERSON = 'matrix.person@skerrow.example'
const PROVENANCE = { method: 'Matrix test method.', citation: 'Matrix (2026).', licence: 'CC BY 4.0' }
export const SITE_BODY = (name: string) => ({
  name,
  latitude: 47.7,
  longitude: -34.8,
  referenceLevel: 'Mean sea level 2020 (illustrative)',
  datum: { kind: 'mean-sea-level', offset: 0 },
  referenceEpoch: 2020,
  landMotion: { rateMmPerYear: -2, sigmaMmPerYear: 0.5, source: 'gps', reference: '', epoch: 2020 },
  thresholds: [{ label: 'Quay', height: 0.8 }],
})
export const RELEASE_CONTENT = {
  form: 'normal',
  baselineYear: 2020,
  anchorYears: [2100],
  mean: [0.1],
  sd: [0.01],
  ...PROVENANCE,
}
export const newRelease = (scenario: string, title: string) => ({
  series: { component: 'glaciers', scenario, title },
  ...RELEASE_CONTENT,
})
export const newCorrelationSet = (scenario: string, title: string) => ({
  scenario,
  title,
  components: ['glaciers', 'greenland'],
  matrix: [
    [1, 0.2],
    [0.2, 1],
  ],
  ...PROVENANCE,
})
// Far from the demo coast, so publishing one never changes a demo outlook.
export const newStoryline = (scenario: string, name: string) => ({
  scenario,
  name,
  description: 'Matrix test storyline.',
  baselineYear: 2020,
  anchorYears: [2100],
  values: { antarctica: [1] },
  ...PROVENANCE,
})
export const newGrid = (component: string, title: string) => ({
  component,
  title,
  latitudes: [-60, -50],
  longitudes: [100, 110],
  factors: [
    [1, 1],
    [1, 1],
  ],
  ...PROVENANCE,
})
export const OUTLOOK_REQUEST = { scenario: 'SSP2-4.5', samples: 2000, seed: 5 }
export const GAUGE_RECORD_CSV = `year,height\n${Array.from({ length: 25 }, (_, i) => `${2000 + i},${(1.2 + i * 0.004).toFixed(3)}`).join('\n')}\n`
/** 100 draws of a land-motion rate (mm/yr), the fewest an upload takes. */
export const LAND_DRAWS_CSV = `draw,rate_mm_per_year\n${Array.from({ length: 100 }, (_, i) => `${i + 1},${(-2 + (i % 10) * 0.1).toFixed(1)}`).join('\n')}\n`
export const ANNUAL_MAXIMA_CSV = `year,value\n${Array.from({ length: 24 }, (_, i) => `${2000 + i},${(1.4 + (i % 5) * 0.05).toFixed(2)}`).join('\n')}\n`

type Kind = 'releases' | 'correlation-sets' | 'scale-factor-grids' | 'storylines'
interface Reviewed { read: string, submit: string, approve: string, return: string, withdraw: string, series?: string }

export interface MatrixFixtures {
  clients: Record<Persona, ApiClient>
  home: {
    organisationId: string
    siteId: string
    editSiteId: string
    thresholdIds: string[]
    outlookId: string
    /** Kelwick's demo pathway and its measures in order. */
    pathwayId: string
    measureIds: string[]
    /** A measure and a pathway of Kelwick that no record names, for the edit and delete routes. */
    spareMeasureId: string
    sparePathwayId: string
    briefingIssued: string
    briefingDraft: string
    briefingToIssue: string
    shareToken: string
    releases: Reviewed & { series: string }
    correlationSets: Reviewed
    grids: Reviewed
    storylines: Reviewed
    userId: string
    watchOf: Record<Exclude<Persona, 'anonymous'>, string>
  }
  foreign: {
    portId: string
    siteId: string
    outlookId: string
    briefingIssued: string
    briefingDraft: string
    shareToken: string
    releaseDraft: string
    releaseSeries: string
    correlationDraft: string
    gridDraft: string
    storylineDraft: string
    userId: string
    watchId: string
    measureId: string
    pathwayId: string
  }
  owners: { port: ApiClient, science: ApiClient, admin: ApiClient }
}

function ok<T = any>(response: { status: number, body: T }, what: string): T {
  expect(response.status, `${what}: ${JSON.stringify(response.body)}`).toBeLessThan(300)
  return response.body
}

async function signedIn(url: string, email: string, password: string) {
  const api = new ApiClient(url)
  await api.signIn(email, password)
  return api
}

/** Records of one reviewed kind in every state the review actions need, authored by `author`. */
async function reviewedSet(
  kind: Kind,
  author: ApiClient,
  approver: ApiClient,
  body: (key: string) => unknown,
): Promise<Reviewed> {
  const create = async (key: string) => ok(await author.post(`/api/${kind}`, body(key)), `${kind} ${key}`)
  const [read, submit, approve, ret, withdraw] = await Promise.all(
    ['read', 'submit', 'approve', 'return', 'withdraw'].map(create),
  )
  for (const record of [approve, ret, withdraw])
    ok(await author.post(`/api/${kind}/${record.id}/submit`), `${kind} submit`)
  ok(await approver.post(`/api/${kind}/${withdraw.id}/approve`), `${kind} approve`)
  return {
    read: read.id,
    submit: submit.id,
    approve: approve.id,
    return: ret.id,
    withdraw: withdraw.id,
    series: read.seriesId,
  }
}

async function briefingFrom(
  planner: ApiClient,
  outlookId: string,
  thresholdIds: string[],
  title: string,
  issue: boolean,
  share = false,
) {
  const draft = ok(
    await planner.post('/api/briefings', { outlookId, title, thresholdIds, years: [2050, 2100] }),
    `briefing ${title}`,
  )
  if (issue) ok(await planner.post(`/api/briefings/${draft.id}/issue`), `issue ${title}`)
  const token = share
    ? (ok(await planner.post(`/api/briefings/${draft.id}/share`), `share ${title}`).shareToken as string)
    : ''
  return { id: draft.id as string, token }
}

async function watchId(api: ApiClient, email: string, siteId: string) {
  ok(await api.post('/api/watches', { email, siteId }), `watch by ${email}`)
  return (ok(await api.get('/api/watches'), 'watches') as { id: string, siteId: string }[]).find(
    w => w.siteId === siteId,
  )!.id
}

export async function createMatrixFixtures(url: string): Promise<MatrixFixtures> {
  const admin = await signedIn(url, ADMIN.email, ADMIN.password)
  const operator = await signedIn(url, OPERATOR.email, OPERATOR.password)
  const organisations = ok(await operator.get('/api/organisations'), 'organisations') as { id: string, kind: string }[]
  const councilId = organisations.find(o => o.kind === 'council')!.id
  const portId = organisations.find(o => o.kind === 'port')!.id

  // Two analysts in the home organisation: one is the matrix's analyst, the other authors what it reviews.
  const person = (email: string, role: string, organisationId: string) => ({
    email,
    name: `Matrix ${role}`,
    role,
    organisationId,
    password: PASSWORD,
  })
  ok(await admin.post('/api/admin/users', person('matrix.analyst@caldwyn.example', 'analyst', councilId)), 'analyst')
  ok(await admin.post('/api/admin/users', person('matrix.author@caldwyn.example', 'analyst', councilId)), 'author')
  const homeUser = ok(
    await admin.post('/api/admin/users', person('matrix.person@caldwyn.example', 'reader', councilId)),
    'home user',
  )
  const foreignUser = ok(
    await operator.post('/api/admin/users', person(FOREIGN_PERSON, 'reader', portId)),
    'foreign user',
  )

  const [reader, planner, analyst, author, port, science] = await Promise.all([
    signedIn(url, READER.email, READER.password), signedIn(url, PLANNER.email, PLANNER.password),
    signedIn(url, 'matrix.analyst@caldwyn.example', PASSWORD), signedIn(url, 'matrix.author@caldwyn.example', PASSWORD),
    signedIn(url, PORT_PLANNER.email, PORT_PLANNER.password), signedIn(url, ANALYST.email, ANALYST.password),
  ])
  const clients: Record<Persona, ApiClient> = {
    anonymous: new ApiClient(url),
    reader,
    planner,
    analyst,
    admin,
    operator,
  }

  // Home: the demo town Kelwick, a site to edit, an outlook and briefings in each state.
  const sites = ok(await planner.get('/api/sites'), 'sites') as { id: string, name: string }[]
  const siteId = sites.find(s => s.name === 'Kelwick')!.id
  const thresholdIds = (ok(await planner.get(`/api/sites/${siteId}`), 'Kelwick').thresholds as { id: string }[]).map(
    t => t.id,
  )
  const editSiteId = ok(await planner.post('/api/sites', SITE_BODY('Matrix Point')), 'edit site').id
  const outlookId = ok(await planner.post(`/api/sites/${siteId}/outlooks`, OUTLOOK_REQUEST), 'home outlook').id
  const issued = await briefingFrom(planner, outlookId, thresholdIds, 'Kelwick (matrix, issued)', true)
  const shared = await briefingFrom(planner, outlookId, thresholdIds, 'Kelwick (matrix, shared)', true, true)
  const draft = await briefingFrom(planner, outlookId, thresholdIds, 'Kelwick (matrix, draft)', false)
  const toIssue = await briefingFrom(planner, outlookId, thresholdIds, 'Kelwick (matrix, to issue)', false)
  const [demoPathway] = ok(await planner.get(`/api/sites/${siteId}/pathways`), 'Kelwick pathways').pathways as {
    id: string
    measureIds: string[]
  }[]
  const spareMeasureId = ok(
    await planner.post(`/api/sites/${siteId}/measures`, { name: 'Matrix spare measure', height: 2, leadTimeYears: 5 }),
    'spare measure',
  ).id as string
  const sparePathwayId = ok(
    await planner.post(`/api/sites/${siteId}/pathways`, {
      name: 'Matrix spare pathway',
      measureIds: demoPathway!.measureIds.slice(0, 2),
    }),
    'spare pathway',
  ).id as string

  const releases = await reviewedSet('releases', author, analyst, key => newRelease('matrix-scenario', `Matrix ${key}`))
  const correlationSets = await reviewedSet('correlation-sets', author, analyst, key =>
    newCorrelationSet(`matrix-${key}`, `Matrix ${key}`),
  )
  const gridComponents: Record<string, string> = {
    read: 'ocean-expansion',
    submit: 'glaciers',
    approve: 'greenland',
    return: 'antarctica',
    withdraw: 'land-water',
  }
  const grids = await reviewedSet('scale-factor-grids', author, analyst, key =>
    newGrid(gridComponents[key]!, `Matrix ${key}`),
  )
  const storylines = await reviewedSet('storylines', author, analyst, key =>
    newStoryline('matrix-scenario', `Matrix ${key}`),
  )

  const watchOf = {
    reader: await watchId(reader, READER.email, siteId),
    planner: await watchId(planner, PLANNER.email, siteId),
    analyst: await watchId(analyst, 'matrix.analyst@caldwyn.example', siteId),
    admin: await watchId(admin, ADMIN.email, siteId),
    operator: await watchId(operator, OPERATOR.email, siteId),
  }

  // Other organisations: a private site with an outlook and briefings, and science drafts.
  const foreignSite = ok(await port.post('/api/sites', SITE_BODY(`Skerrow ${FOREIGN_MARKER}`)), 'foreign site')
  const foreignThresholds = (
    ok(await port.get(`/api/sites/${foreignSite.id}`), 'foreign site').thresholds as { id: string }[]
  ).map(t => t.id)
  const foreignOutlook = ok(
    await port.post(`/api/sites/${foreignSite.id}/outlooks`, OUTLOOK_REQUEST),
    'foreign outlook',
  ).id
  const foreignIssued = await briefingFrom(port, foreignOutlook, foreignThresholds, `Issued ${FOREIGN_MARKER}`, true)
  const foreignShared = await briefingFrom(
    port,
    foreignOutlook,
    foreignThresholds,
    'Skerrow shared briefing',
    true,
    true,
  )
  const foreignDraft = await briefingFrom(port, foreignOutlook, foreignThresholds, `Draft ${FOREIGN_MARKER}`, false)
  const releaseDraft = ok(
    await science.post('/api/releases', newRelease('matrix-scenario', `Release ${FOREIGN_MARKER}`)),
    'foreign release',
  )
  const correlationDraft = ok(
    await science.post('/api/correlation-sets', newCorrelationSet('matrix-foreign', `Set ${FOREIGN_MARKER}`)),
    'foreign set',
  )
  const gridDraft = ok(
    await science.post('/api/scale-factor-grids', newGrid('greenland', `Grid ${FOREIGN_MARKER}`)),
    'foreign grid',
  )
  const storylineDraft = ok(
    await science.post('/api/storylines', newStoryline('matrix-scenario', `Storyline ${FOREIGN_MARKER}`)),
    'foreign storyline',
  )
  const foreignWatch = await watchId(port, PORT_PLANNER.email, foreignSite.id)
  const foreignMeasureIds = [
    ok(
      await port.post(`/api/sites/${foreignSite.id}/measures`, {
        name: `Measure ${FOREIGN_MARKER}`,
        height: 2,
        leadTimeYears: 5,
      }),
      'foreign measure',
    ).id as string,
    ok(
      await port.post(`/api/sites/${foreignSite.id}/measures`, {
        name: `Second measure ${FOREIGN_MARKER}`,
        height: 3,
        leadTimeYears: 5,
      }),
      'second foreign measure',
    ).id as string,
  ]
  const foreignPathway = ok(
    await port.post(`/api/sites/${foreignSite.id}/pathways`, {
      name: `Pathway ${FOREIGN_MARKER}`,
      measureIds: foreignMeasureIds,
    }),
    'foreign pathway',
  ).id as string

  return {
    clients,
    home: {
      organisationId: councilId,
      siteId,
      editSiteId,
      thresholdIds,
      outlookId,
      pathwayId: demoPathway!.id,
      measureIds: demoPathway!.measureIds,
      spareMeasureId,
      sparePathwayId,
      briefingIssued: issued.id,
      briefingDraft: draft.id,
      briefingToIssue: toIssue.id,
      shareToken: shared.token,
      releases: { ...releases, series: releases.series! },
      correlationSets,
      grids,
      storylines,
      userId: homeUser.id,
      watchOf,
    },
    foreign: {
      portId,
      siteId: foreignSite.id,
      outlookId: foreignOutlook,
      briefingIssued: foreignIssued.id,
      briefingDraft: foreignDraft.id,
      shareToken: foreignShared.token,
      releaseDraft: releaseDraft.id,
      releaseSeries: releaseDraft.seriesId,
      correlationDraft: correlationDraft.id,
      gridDraft: gridDraft.id,
      storylineDraft: storylineDraft.id,
      userId: foreignUser.id,
      watchId: foreignWatch,
      measureId: foreignMeasureIds[0]!,
      pathwayId: foreignPathway,
    },
    owners: { port, science, admin },
  }
}

/** Every id and marker of the other organisations' private records. */
export function foreignSecrets(f: MatrixFixtures['foreign']): string[] {
  return [
    FOREIGN_MARKER,
    FOREIGN_PERSON,
    f.userId,
    f.siteId,
    f.outlookId,
    f.briefingIssued,
    f.briefingDraft,
    f.releaseDraft,
    f.releaseSeries,
    f.correlationDraft,
    f.gridDraft,
    f.storylineDraft,
    f.watchId,
  ]
}

/** How the other organisations' owners see their private records (compared before and after the matrix). */
export async function foreignSnapshot(fx: MatrixFixtures) {
  const { port, science } = fx.owners
  const f = fx.foreign
  const reads = await Promise.all([
    port.get(`/api/sites/${f.siteId}`),
    port.get(`/api/outlooks/${f.outlookId}`),
    port.get(`/api/briefings/${f.briefingIssued}`),
    port.get(`/api/briefings/${f.briefingDraft}`),
    port.get('/api/watches'),
    port.get('/api/briefings'),
    science.get(`/api/releases/${f.releaseDraft}`),
    science.get(`/api/correlation-sets/${f.correlationDraft}`),
    science.get(`/api/scale-factor-grids/${f.gridDraft}`),
    science.get(`/api/storylines/${f.storylineDraft}`),
  ])
  return reads.map(r => ({ status: r.status, body: r.body }))
}

export { demoUser }
