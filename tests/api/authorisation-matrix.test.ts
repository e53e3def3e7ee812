import { readdirSync } from 'node:fs'
import { join, relative } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  ANNUAL_MAXIMA_CSV,
  GAUGE_RECORD_CSV,
  LAND_DRAWS_CSV,
  OUTLOOK_REQUEST,
  PERSONAS,
  RELEASE_CONTENT,
  SITE_BODY,
  createMatrixFixtures,
  foreignSecrets,
  foreignSnapshot,
  newCorrelationSet,
  newStoryline,
  newGrid,
  newRelease,
  type MatrixFixtures,
  type Persona,
} from '../support/matrix-fixtures'
import { ROOT, startServer, type RunningServer } from '../support/server'

// Every route file under server/api, asked by each role of one organisation (the Caldwyn council)
// about a record of that organisation and about one of another organisation. Another
// organisation's private record answers 404 exactly like a missing one, never 403 (which would
// confirm it exists) and never with its data. A role that is not enough answers 403 before the
// record is looked up, so it reveals nothing either. An admin administers their own organisation's
// people, outbox and audit; the operator administers every organisation (routes marked `global`)
// and alone reads the demo mailbox and starts recomputations.

type Scope = 'own' | 'other'
type Status = number | [own: number, other: number]
type Build<T> = (fx: MatrixFixtures, scope: Scope, persona: Persona) => T

interface RouteCase {
  /** The URL for this cell (own-organisation record, or another organisation's). */
  url: Build<string>
  body?: Build<unknown>
  /** Expected status per persona; a pair gives [own organisation, other organisation]. */
  expect: Record<Persona, Status>
  /** One cell per persona instead of two: the route names no record of an organisation. */
  unscoped?: true
  /** Public by design: a share link opens another organisation's issued briefing. */
  publicLink?: true
  /** The operator sees every organisation here by design. */
  global?: true
}

const pick = <T>(scope: Scope, own: T, other: T) => (scope === 'own' ? own : other)
const anyone = (status: number): Record<Persona, Status> => ({
  anonymous: status,
  reader: status,
  planner: status,
  analyst: status,
  admin: status,
  operator: status,
})
/** Signed-in members of the organisation read it; other organisations' records look missing. */
const members: Record<Persona, Status> = {
  anonymous: 401,
  reader: [200, 404],
  planner: [200, 404],
  analyst: [200, 404],
  admin: [200, 404],
  operator: [200, 404],
}
/** Only `role` may; on another organisation's record it gets 404. */
const only = (role: Persona, status: number): Record<Persona, Status> =>
  ({ ...anyone(403), anonymous: 401, [role]: [status, 404] }) as Record<Persona, Status>
/** The organisation's admin (on their own organisation) and the operator (on every one). */
const admins = (admin: Status, operator: Status = admin): Record<Persona, Status> => ({
  ...anyone(403),
  anonymous: 401,
  admin,
  operator,
})
const operatorOnly = (status: number): Record<Persona, Status> => ({ ...anyone(403), anonymous: 401, operator: status })
/** Public science records: anyone sees published ones; drafts only inside their organisation. */
const draftsInside: Record<Persona, Status> = { ...members, anonymous: 404 }
const UNKNOWN_TOKEN = 'x'.repeat(32)
const emailOf = (persona: Persona, scope: Scope, what: string) => `${what}.${persona}.${scope}@matrix.example`

const ROUTES: Record<string, RouteCase> = {
  // Public account links: the token is the key, and an unknown one says so to anyone.
  'account/invitation/accept.post.ts': {
    unscoped: true,
    url: () => '/api/account/invitation/accept',
    body: () => ({ token: UNKNOWN_TOKEN, password: 'Matrix-harbour-gauge-42' }),
    expect: anyone(404),
  },
  'account/invitation/index.get.ts': {
    unscoped: true,
    url: () => `/api/account/invitation?token=${UNKNOWN_TOKEN}`,
    expect: anyone(404),
  },
  'account/password-reset/complete.post.ts': {
    unscoped: true,
    url: () => '/api/account/password-reset/complete',
    body: () => ({ token: UNKNOWN_TOKEN, password: 'Matrix-harbour-gauge-42' }),
    expect: anyone(404),
  },
  'account/password-reset/index.post.ts': {
    unscoped: true,
    url: () => '/api/account/password-reset',
    body: (_fx, scope, persona) => ({ email: emailOf(persona, scope, 'reset') }),
    expect: anyone(202),
  },
  'auth/sign-in.post.ts': {
    unscoped: true,
    url: () => '/api/auth/sign-in',
    body: (_fx, scope, persona) => ({ email: emailOf(persona, scope, 'nobody'), password: 'not-the-password' }),
    expect: anyone(401),
  },

  'admin/audit.get.ts': { unscoped: true, global: true, url: () => '/api/admin/audit', expect: admins(200) },
  'admin/mailbox.get.ts': { unscoped: true, global: true, url: () => '/api/admin/mailbox', expect: operatorOnly(200) },
  'admin/outbox.get.ts': { unscoped: true, global: true, url: () => '/api/admin/outbox', expect: admins(200) },
  'admin/recomputations/index.get.ts': {
    unscoped: true,
    global: true,
    url: () => '/api/admin/recomputations',
    expect: operatorOnly(200),
  },
  'admin/recomputations/index.post.ts': {
    unscoped: true,
    global: true,
    url: () => '/api/admin/recomputations',
    body: () => ({ scenario: 'SSP1-2.6' }),
    expect: operatorOnly(202),
  },
  'admin/users/index.get.ts': { unscoped: true, global: true, url: () => '/api/admin/users', expect: admins(200) },
  // Another organisation is not the admin's to choose: it reads as one that does not exist (400).
  'admin/users/index.post.ts': {
    global: true,
    url: () => '/api/admin/users',
    expect: admins([201, 400], 201),
    body: (fx, scope, persona) => ({
      email: emailOf(persona, scope, 'made'),
      name: 'Made by matrix',
      role: 'reader',
      organisationId: pick(scope, fx.home.organisationId, fx.foreign.portId),
      password: 'Matrix-harbour-gauge-42',
    }),
  },
  'admin/users/[id].patch.ts': {
    global: true,
    url: (fx, scope) => `/api/admin/users/${pick(scope, fx.home.userId, fx.foreign.userId)}`,
    body: () => ({ name: 'Matrix reader' }),
    expect: admins([200, 404], 200),
  },
  'admin/invitations/index.post.ts': {
    global: true,
    url: () => '/api/admin/invitations',
    expect: admins([202, 400], 202),
    body: (fx, scope, persona) => ({
      email: emailOf(persona, scope, 'invited'),
      name: 'Invited by matrix',
      role: 'reader',
      organisationId: pick(scope, fx.home.organisationId, fx.foreign.portId),
    }),
  },
  'organisations/index.get.ts': { unscoped: true, global: true, url: () => '/api/organisations', expect: admins(200) },
  // The science an organisation adopted: its members read it, its planners and administrators change it;
  // another organisation's answers 404 to everyone, the operator included (it is not theirs to choose).
  'organisations/[id]/adoption.get.ts': {
    url: (fx, scope) => `/api/organisations/${pick(scope, fx.home.organisationId, fx.foreign.portId)}/adoption`,
    expect: members,
  },
  'organisations/[id]/adoption.put.ts': {
    url: (fx, scope) => `/api/organisations/${pick(scope, fx.home.organisationId, fx.foreign.portId)}/adoption`,
    body: () => ({ scenario: 'SSP2-4.5', series: {} }),
    expect: { ...anyone(403), anonymous: 401, planner: [200, 404], admin: [200, 404], operator: [200, 404] },
  },

  'health.get.ts': { unscoped: true, url: () => '/api/health', expect: anyone(200) },
  'scenarios/index.get.ts': { unscoped: true, url: () => '/api/scenarios', expect: anyone(200) },
  'me.get.ts': { unscoped: true, url: () => '/api/me', expect: { ...anyone(200), anonymous: 401 } },
  // What is waiting in the caller's own organisation, so it names no record of another.
  'attention.get.ts': { unscoped: true, url: () => '/api/attention', expect: { ...anyone(200), anonymous: 401 } },
  'me.patch.ts': {
    unscoped: true,
    url: () => '/api/me',
    body: () => ({ locale: 'en' }),
    expect: { ...anyone(200), anonymous: 401 },
  },

  // Sites, outlooks and briefings belong to an organisation; planners change them.
  'sites/index.get.ts': { unscoped: true, url: () => '/api/sites', expect: { ...anyone(200), anonymous: 401 } },
  // The caller's own organisation's sites only, so it names no record of another.
  'exports/sites.geojson.get.ts': {
    unscoped: true,
    url: () => '/api/exports/sites.geojson',
    expect: { ...anyone(200), anonymous: 401 },
  },
  'sites/index.post.ts': {
    unscoped: true,
    url: () => '/api/sites',
    body: (_fx, _s, persona) => SITE_BODY(`Matrix new site (${persona})`),
    expect: { ...anyone(403), anonymous: 401, planner: 201 },
  },
  'sites/[id].get.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}`,
    expect: members,
  },
  'sites/[id].patch.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.editSiteId, fx.foreign.siteId)}`,
    body: () => SITE_BODY('Matrix Point'),
    expect: only('planner', 200),
  },
  'sites/[id]/annual-maxima.post.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.editSiteId, fx.foreign.siteId)}/annual-maxima`,
    body: () => ({ csv: ANNUAL_MAXIMA_CSV }),
    expect: only('planner', 200),
  },
  'sites/[id]/gauge-record.get.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/gauge-record`,
    expect: members,
  },
  'sites/[id]/gauge-record.post.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.editSiteId, fx.foreign.siteId)}/gauge-record`,
    body: () => ({ csv: GAUGE_RECORD_CSV }),
    expect: only('planner', 201),
  },
  'sites/[id]/land-motion-draws.get.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/land-motion-draws`,
    expect: members,
  },
  'sites/[id]/land-motion-draws.post.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.editSiteId, fx.foreign.siteId)}/land-motion-draws`,
    body: () => ({ csv: LAND_DRAWS_CSV, source: 'gps' }),
    expect: only('planner', 201),
  },
  'sites/[id]/outlooks.get.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/outlooks`,
    expect: members,
  },
  // The same request as the stored outlook: served from the store (200), nothing recomputed.
  'sites/[id]/outlooks.post.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/outlooks`,
    body: () => OUTLOOK_REQUEST,
    expect: only('planner', 200),
  },
  // Adaptation pathways: members read them; planners add measures and pathways and record decisions.
  'sites/[id]/pathways.get.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/pathways`,
    expect: members,
  },
  'sites/[id]/signposts.get.ts': {
    url: (fx, scope) =>
      `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/signposts?pathway=${fx.home.pathwayId}`
      + `&measure=${fx.home.measureIds[0]}&scenario=${OUTLOOK_REQUEST.scenario}`,
    expect: members,
  },
  'sites/[id]/pathways.pdf.get.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/pathways.pdf`,
    expect: members,
  },
  'sites/[id]/measures.post.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/measures`,
    expect: only('planner', 201),
    body: () => ({ name: 'Matrix measure', height: 2, kind: 'mean-sea-level', leadTimeYears: 5 }),
  },
  'sites/[id]/pathways.post.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/pathways`,
    expect: only('planner', 201),
    body: fx => ({ name: 'Matrix pathway', measureIds: fx.home.measureIds.slice(0, 2) }),
  },
  // Edited, then deleted, by the site's own planners: the spare ones, which no decision record names.
  'sites/[id]/measures/[measureId].patch.ts': {
    url: (fx, scope) => scope === 'own'
      ? `/api/sites/${fx.home.siteId}/measures/${fx.home.spareMeasureId}`
      : `/api/sites/${fx.foreign.siteId}/measures/${fx.foreign.measureId}`,
    expect: only('planner', 200),
    body: () => ({ name: 'Matrix spare measure, edited', height: 2.2, kind: 'mean-sea-level', leadTimeYears: 5 }),
  },
  'sites/[id]/measures/[measureId].delete.ts': {
    url: (fx, scope) => scope === 'own'
      ? `/api/sites/${fx.home.siteId}/measures/${fx.home.spareMeasureId}`
      : `/api/sites/${fx.foreign.siteId}/measures/${fx.foreign.measureId}`,
    expect: only('planner', 200),
  },
  'sites/[id]/pathways/[pathwayId].patch.ts': {
    url: (fx, scope) => scope === 'own'
      ? `/api/sites/${fx.home.siteId}/pathways/${fx.home.sparePathwayId}`
      : `/api/sites/${fx.foreign.siteId}/pathways/${fx.foreign.pathwayId}`,
    expect: only('planner', 200),
    body: fx => ({ name: 'Matrix spare pathway, edited', measureIds: fx.home.measureIds.slice(0, 3) }),
  },
  'sites/[id]/pathways/[pathwayId].delete.ts': {
    url: (fx, scope) => scope === 'own'
      ? `/api/sites/${fx.home.siteId}/pathways/${fx.home.sparePathwayId}`
      : `/api/sites/${fx.foreign.siteId}/pathways/${fx.foreign.pathwayId}`,
    expect: only('planner', 200),
  },
  'sites/[id]/decisions.post.ts': {
    url: (fx, scope) => `/api/sites/${pick(scope, fx.home.siteId, fx.foreign.siteId)}/decisions`,
    expect: only('planner', 201),
    body: fx => ({
      pathwayId: fx.home.pathwayId,
      measureId: fx.home.measureIds[1],
      scenario: OUTLOOK_REQUEST.scenario,
      tolerance: 0.5,
      rationale: 'Matrix decision',
      reviewDate: '2099-01-01',
    }),
  },
  'outlooks/[id].get.ts': {
    url: (fx, scope) => `/api/outlooks/${pick(scope, fx.home.outlookId, fx.foreign.outlookId)}`,
    expect: members,
  },
  'outlooks/[id]/csv.get.ts': {
    url: (fx, scope) => `/api/outlooks/${pick(scope, fx.home.outlookId, fx.foreign.outlookId)}/csv`,
    expect: members,
  },
  'outlooks/[id]/status.get.ts': {
    url: (fx, scope) => `/api/outlooks/${pick(scope, fx.home.outlookId, fx.foreign.outlookId)}/status`,
    expect: members,
  },

  'briefings/index.get.ts': { unscoped: true, url: () => '/api/briefings', expect: { ...anyone(200), anonymous: 401 } },
  'briefings/index.post.ts': {
    url: () => '/api/briefings',
    expect: only('planner', 201),
    body: (fx, scope) => ({
      outlookId: pick(scope, fx.home.outlookId, fx.foreign.outlookId),
      title: 'Matrix new briefing',
      thresholdIds: fx.home.thresholdIds,
      years: [2050],
    }),
  },
  'briefings/[id].get.ts': {
    url: (fx, scope) => `/api/briefings/${pick(scope, fx.home.briefingIssued, fx.foreign.briefingIssued)}`,
    expect: members,
  },
  'briefings/[id].patch.ts': {
    url: (fx, scope) => `/api/briefings/${pick(scope, fx.home.briefingDraft, fx.foreign.briefingDraft)}`,
    expect: only('planner', 200),
    body: fx => ({ title: 'Kelwick (matrix, draft)', thresholdIds: fx.home.thresholdIds, years: [2050, 2100] }),
  },
  'briefings/[id]/issue.post.ts': {
    url: (fx, scope) => `/api/briefings/${pick(scope, fx.home.briefingToIssue, fx.foreign.briefingDraft)}/issue`,
    expect: only('planner', 200),
  },
  'briefings/[id]/pdf.get.ts': {
    url: (fx, scope) => `/api/briefings/${pick(scope, fx.home.briefingIssued, fx.foreign.briefingIssued)}/pdf`,
    expect: members,
  },
  'briefings/[id]/share.post.ts': {
    url: (fx, scope) => `/api/briefings/${pick(scope, fx.home.briefingIssued, fx.foreign.briefingIssued)}/share`,
    expect: only('planner', 200),
  },
  'briefings/[id]/share.delete.ts': {
    url: (fx, scope) => `/api/briefings/${pick(scope, fx.home.briefingIssued, fx.foreign.briefingIssued)}/share`,
    expect: only('planner', 200),
  },
  'briefings/[id]/versions.post.ts': {
    url: (fx, scope) => `/api/briefings/${pick(scope, fx.home.briefingIssued, fx.foreign.briefingIssued)}/versions`,
    expect: only('planner', 201),
  },
  // A shared briefing is public by its link, whichever organisation issued it.
  'shared/[token].get.ts': {
    publicLink: true,
    url: (fx, scope) => `/api/shared/${pick(scope, fx.home.shareToken, fx.foreign.shareToken)}`,
    expect: anyone(200),
  },
  'shared/[token]/pdf.get.ts': {
    publicLink: true,
    url: (fx, scope) => `/api/shared/${pick(scope, fx.home.shareToken, fx.foreign.shareToken)}/pdf`,
    expect: anyone(200),
  },

  // Watches: anyone may ask through a shared briefing; members by a site of their organisation.
  'watches/index.get.ts': { unscoped: true, url: () => '/api/watches', expect: { ...anyone(200), anonymous: 401 } },
  'watches/index.post.ts': {
    url: () => '/api/watches',
    expect: {
      anonymous: 202,
      reader: [202, 404],
      planner: [202, 404],
      analyst: [202, 404],
      admin: [202, 404],
      operator: [202, 404],
    },
    body: (fx, scope, persona) =>
      persona === 'anonymous'
        ? {
            email: emailOf(persona, scope, 'watcher'),
            shareToken: pick(scope, fx.home.shareToken, fx.foreign.shareToken),
          }
        : { email: emailOf(persona, scope, 'watcher'), siteId: pick(scope, fx.home.siteId, fx.foreign.siteId) },
  },
  'watches/[id].delete.ts': {
    url: (fx, scope, persona) =>
      `/api/watches/${scope === 'other' || persona === 'anonymous' ? fx.foreign.watchId : fx.home.watchOf[persona]}`,
    expect: members,
  },
  'watches/confirm.post.ts': {
    unscoped: true,
    url: () => '/api/watches/confirm',
    body: () => ({ token: UNKNOWN_TOKEN }),
    expect: anyone(404),
  },
  'watches/confirm.get.ts': {
    unscoped: true,
    url: () => `/api/watches/confirm?token=${UNKNOWN_TOKEN}`,
    expect: anyone(404),
  },
  'watches/unsubscribe.get.ts': {
    unscoped: true,
    url: () => `/api/watches/unsubscribe?token=${UNKNOWN_TOKEN}`,
    expect: anyone(404),
  },
  'watches/unsubscribe.post.ts': {
    unscoped: true,
    url: () => `/api/watches/unsubscribe?token=${UNKNOWN_TOKEN}`,
    expect: anyone(404),
  },

  // Science: published records are public; drafts stay inside their organisation; analysts act.
  'releases/index.get.ts': { unscoped: true, url: () => '/api/releases', expect: anyone(200) },
  'releases/index.post.ts': {
    url: () => '/api/releases',
    expect: only('analyst', 201),
    body: (fx, scope, persona) =>
      scope === 'own'
        ? newRelease('matrix-scenario', `Matrix new (${persona})`)
        : { seriesId: fx.foreign.releaseSeries, ...RELEASE_CONTENT },
  },
  'releases/preview.post.ts': {
    unscoped: true,
    url: () => '/api/releases/preview',
    body: () => RELEASE_CONTENT,
    expect: { ...anyone(403), anonymous: 401, analyst: 200 },
  },
  'releases/[id].get.ts': {
    url: (fx, scope) => `/api/releases/${pick(scope, fx.home.releases.read, fx.foreign.releaseDraft)}`,
    expect: draftsInside,
  },
  'releases/[id].patch.ts': {
    url: (fx, scope) => `/api/releases/${pick(scope, fx.home.releases.read, fx.foreign.releaseDraft)}`,
    body: () => RELEASE_CONTENT,
    expect: only('analyst', 200),
  },
  'releases/[id]/csv.get.ts': {
    url: (fx, scope) => `/api/releases/${pick(scope, fx.home.releases.read, fx.foreign.releaseDraft)}/csv`,
    expect: draftsInside,
  },
  'releases/[id]/submit.post.ts': {
    url: (fx, scope) => `/api/releases/${pick(scope, fx.home.releases.submit, fx.foreign.releaseDraft)}/submit`,
    expect: only('analyst', 200),
  },
  'releases/[id]/approve.post.ts': {
    url: (fx, scope) => `/api/releases/${pick(scope, fx.home.releases.approve, fx.foreign.releaseDraft)}/approve`,
    expect: only('analyst', 200),
  },
  // Read while the release waits for approval (the return route's fixture is returned only further down).
  'releases/[id]/reach.get.ts': {
    url: (fx, scope) => `/api/releases/${pick(scope, fx.home.releases.return, fx.foreign.releaseDraft)}/reach`,
    expect: only('analyst', 200),
  },
  'releases/[id]/return.post.ts': {
    url: (fx, scope) => `/api/releases/${pick(scope, fx.home.releases.return, fx.foreign.releaseDraft)}/return`,
    body: () => ({ note: 'Check the method.' }),
    expect: only('analyst', 200),
  },
  'releases/[id]/withdraw.post.ts': {
    url: (fx, scope) => `/api/releases/${pick(scope, fx.home.releases.withdraw, fx.foreign.releaseDraft)}/withdraw`,
    body: () => ({ reason: 'Matrix test.' }),
    expect: only('analyst', 200),
  },
  'series/[id].get.ts': {
    url: (fx, scope) => `/api/series/${pick(scope, fx.home.releases.series, fx.foreign.releaseSeries)}`,
    expect: draftsInside,
  },

  'correlation-sets/index.get.ts': { unscoped: true, url: () => '/api/correlation-sets', expect: anyone(200) },
  'correlation-sets/index.post.ts': {
    unscoped: true,
    url: () => '/api/correlation-sets',
    body: (_fx, _s, persona) => newCorrelationSet(`matrix-new-${persona}`, 'Matrix new set'),
    expect: { ...anyone(403), anonymous: 401, analyst: 201 },
  },
  'correlation-sets/[id].get.ts': {
    url: (fx, scope) =>
      `/api/correlation-sets/${pick(scope, fx.home.correlationSets.read, fx.foreign.correlationDraft)}`,
    expect: draftsInside,
  },
  'correlation-sets/[id]/submit.post.ts': {
    url: (fx, scope) =>
      `/api/correlation-sets/${pick(scope, fx.home.correlationSets.submit, fx.foreign.correlationDraft)}/submit`,
    expect: only('analyst', 200),
  },
  'correlation-sets/[id]/approve.post.ts': {
    url: (fx, scope) =>
      `/api/correlation-sets/${pick(scope, fx.home.correlationSets.approve, fx.foreign.correlationDraft)}/approve`,
    expect: only('analyst', 200),
  },
  'correlation-sets/[id]/return.post.ts': {
    url: (fx, scope) =>
      `/api/correlation-sets/${pick(scope, fx.home.correlationSets.return, fx.foreign.correlationDraft)}/return`,
    body: () => ({ note: 'Check the matrix.' }),
    expect: only('analyst', 200),
  },
  'correlation-sets/[id]/withdraw.post.ts': {
    url: (fx, scope) =>
      `/api/correlation-sets/${pick(scope, fx.home.correlationSets.withdraw, fx.foreign.correlationDraft)}/withdraw`,
    body: () => ({ reason: 'Matrix test.' }),
    expect: only('analyst', 200),
  },
  'storylines/index.get.ts': { unscoped: true, url: () => '/api/storylines', expect: anyone(200) },
  'storylines/index.post.ts': {
    unscoped: true,
    url: () => '/api/storylines',
    body: (_fx, _s, persona) => newStoryline('matrix-scenario', `Matrix new storyline ${persona}`),
    expect: { ...anyone(403), anonymous: 401, analyst: 201 },
  },
  'storylines/[id].get.ts': {
    url: (fx, scope) => `/api/storylines/${pick(scope, fx.home.storylines.read, fx.foreign.storylineDraft)}`,
    expect: draftsInside,
  },
  'storylines/[id]/submit.post.ts': {
    url: (fx, scope) => `/api/storylines/${pick(scope, fx.home.storylines.submit, fx.foreign.storylineDraft)}/submit`,
    expect: only('analyst', 200),
  },
  'storylines/[id]/approve.post.ts': {
    url: (fx, scope) => `/api/storylines/${pick(scope, fx.home.storylines.approve, fx.foreign.storylineDraft)}/approve`,
    expect: only('analyst', 200),
  },
  'storylines/[id]/return.post.ts': {
    url: (fx, scope) => `/api/storylines/${pick(scope, fx.home.storylines.return, fx.foreign.storylineDraft)}/return`,
    body: () => ({ note: 'Check the values.' }),
    expect: only('analyst', 200),
  },
  'storylines/[id]/withdraw.post.ts': {
    url: (fx, scope) =>
      `/api/storylines/${pick(scope, fx.home.storylines.withdraw, fx.foreign.storylineDraft)}/withdraw`,
    body: () => ({ reason: 'Matrix test.' }),
    expect: only('analyst', 200),
  },

  'scale-factor-grids/index.get.ts': { unscoped: true, url: () => '/api/scale-factor-grids', expect: anyone(200) },
  'scale-factor-grids/index.post.ts': {
    unscoped: true,
    url: () => '/api/scale-factor-grids',
    body: () => newGrid('regional-ocean', 'Matrix new grid'),
    expect: { ...anyone(403), anonymous: 401, analyst: 201 },
  },
  'scale-factor-grids/[id].get.ts': {
    url: (fx, scope) => `/api/scale-factor-grids/${pick(scope, fx.home.grids.read, fx.foreign.gridDraft)}`,
    expect: draftsInside,
  },
  'scale-factor-grids/[id]/submit.post.ts': {
    url: (fx, scope) => `/api/scale-factor-grids/${pick(scope, fx.home.grids.submit, fx.foreign.gridDraft)}/submit`,
    expect: only('analyst', 200),
  },
  'scale-factor-grids/[id]/approve.post.ts': {
    url: (fx, scope) => `/api/scale-factor-grids/${pick(scope, fx.home.grids.approve, fx.foreign.gridDraft)}/approve`,
    expect: only('analyst', 200),
  },
  'scale-factor-grids/[id]/return.post.ts': {
    url: (fx, scope) => `/api/scale-factor-grids/${pick(scope, fx.home.grids.return, fx.foreign.gridDraft)}/return`,
    body: () => ({ note: 'Check the grid.' }),
    expect: only('analyst', 200),
  },
  'scale-factor-grids/[id]/withdraw.post.ts': {
    url: (fx, scope) => `/api/scale-factor-grids/${pick(scope, fx.home.grids.withdraw, fx.foreign.gridDraft)}/withdraw`,
    body: () => ({ reason: 'Matrix test.' }),
    expect: only('analyst', 200),
  },
}

const API_DIR = join(ROOT, 'server/api')

function routeFiles(dir = API_DIR): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap(entry => entry.isDirectory()
    ? routeFiles(join(dir, entry.name))
    : [relative(API_DIR, join(dir, entry.name))])
}

/** 'sites/[id]/outlooks.post.ts' → ['POST', '/api/sites/[id]/outlooks']. */
function methodAndPath(file: string): [string, string] {
  const match = file.match(/^(.*?)(?:\/?index)?\.(get|post|patch|put|delete)\.ts$/)
  if (!match) throw new Error(`${file}: a route file needs a method suffix (.get.ts, .post.ts, …)`)
  return [match[2]!.toUpperCase(), `/api/${match[1]}`.replace(/\/$/, '')]
}

interface Cell {
  name: string
  file: string
  method: string
  route: RouteCase
  persona: Persona
  scope: Scope
  status: number
}

const CELLS: Cell[] = Object.entries(ROUTES).flatMap(([file, route]) => {
  const [method, path] = methodAndPath(file)
  const scopes: Scope[] = route.unscoped ? ['own'] : ['own', 'other']
  return PERSONAS.flatMap(persona => scopes.map((scope) => {
    const wanted = route.expect[persona]
    const status = Array.isArray(wanted) ? (scope === 'own' ? wanted[0] : wanted[1]) : wanted
    const where = route.unscoped ? '' : scope === 'own' ? ' · own org' : ' · other org'
    return { name: `${method} ${path} · ${persona}${where} → ${status}`, file, method, route, persona, scope, status }
  }))
})

/** The body as text without the echoed request URL (which carries the id asked about). */
function answerText(body: unknown): string {
  if (body && typeof body === 'object' && !Array.isArray(body)) {
    const { url: _url, ...rest } = body as Record<string, unknown>
    return JSON.stringify(rest)
  }
  return typeof body === 'string' ? body : JSON.stringify(body ?? '')
}

let server: RunningServer
let fx: MatrixFixtures
let secrets: string[]
let before: Awaited<ReturnType<typeof foreignSnapshot>>

beforeAll(async () => {
  server = await startServer()
  fx = await createMatrixFixtures(server.url)
  secrets = foreignSecrets(fx.foreign)
  before = await foreignSnapshot(fx)
})
afterAll(async () => { await server?.stop() })

describe('authorisation matrix', () => {
  it('has an entry for every route file under server/api, and none for a file that is gone', () => {
    const files = routeFiles().sort()
    const missing = files.filter(file => !(file in ROUTES))
    expect(
      missing,
      `Add these route files to ROUTES in tests/api/authorisation-matrix.test.ts: ${missing.join(', ')}`,
    ).toEqual([])
    const gone = Object.keys(ROUTES).filter(file => !files.includes(file))
    expect(gone, `These ROUTES entries name no file under server/api: ${gone.join(', ')}`).toEqual([])
  })

  it.each(CELLS.map(cell => [cell.name, cell] as const))('%s', async (_name, cell) => {
    const { route, persona, scope } = cell
    const client = fx.clients[persona]
    const url = route.url(fx, scope, persona)
    const body = route.body?.(fx, scope, persona)
    const response = await client.request(cell.method, url, body)

    expect(response.status, answerText(response.body)).toBe(cell.status)
    if (cell.status >= 400) expect(response.body.message, 'a refusal says why').toMatch(/\w/)
    if (cell.status === 404 && scope === 'other')
      expect(response.body.message).toMatch(/^(No such|This link|This briefing link)/)
    if (response.status === 403) expect(response.body.message).toMatch(/needs the \w+ role/)

    // Zero leaks: nothing of another organisation's private records comes back, whatever the status.
    const exempt = route.publicLink || (route.global && persona === 'operator')
    if (!exempt) {
      const text = answerText(response.body)
      for (const secret of secrets)
        expect(text.includes(secret), `the answer carries ${secret} of another organisation`).toBe(false)
    }
  })

  // The pages read the same API on the server; their HTML (and its payload) must not carry the record
  // either. The role that may open such a page gets 404; another role may get 403 from the page's role check.
  type ForeignPage = [name: string, opener: 'planner' | 'analyst', path: (f: MatrixFixtures['foreign']) => string]
  it.each<ForeignPage>([
    ['site', 'planner', f => `/sites/${f.siteId}`],
    ['outlook', 'planner', f => `/sites/${f.siteId}/outlooks/${f.outlookId}`],
    ['adaptation pathways', 'planner', f => `/sites/${f.siteId}/pathways`],
    ['briefing', 'planner', f => `/briefings/${f.briefingIssued}`],
    ['draft briefing editor', 'planner', f => `/briefings/${f.briefingDraft}/edit`],
    ['release draft', 'analyst', f => `/library/releases/${f.releaseDraft}`],
    ['series', 'analyst', f => `/library/series/${f.releaseSeries}`],
    ['correlation set draft', 'analyst', f => `/library/correlation-sets/${f.correlationDraft}`],
    ['grid draft', 'analyst', f => `/library/scale-factor-grids/${f.gridDraft}`],
  ])(
    'the page of another organisation\'s %s is not found for the %s and shows nobody any of it',
    async (_name, opener, path) => {
      const url = path(fx.foreign)
      for (const persona of ['planner', 'analyst'] as const) {
        const response = await fx.clients[persona].fetchRaw(url)
        if (persona === opener) expect(response.status, `${persona} ${url}`).toBe(404)
        else expect([403, 404], `${persona} ${url}`).toContain(response.status)
        const shown = (await response.text()).replaceAll(url, '')
        for (const secret of secrets) expect(shown.includes(secret), `${persona} ${url} carries ${secret}`).toBe(false)
      }
    },
  )

  it('left every record of the other organisations as it was', async () => {
    expect(await foreignSnapshot(fx)).toEqual(before)
  })
})
