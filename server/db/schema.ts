import { sql } from 'drizzle-orm'
import {
  boolean,
  customType,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core'
import { ORGANISATION_KINDS, ROLES } from '../../shared/types/roles'
import {
  AMOUNT_UNITS,
  DATUM_KINDS,
  LAND_MOTION_SOURCES,
  OUTLOOK_STATES,
  RELEASE_FORMS,
  REVIEW_STATES,
  THRESHOLD_KINDS,
} from '../../shared/types/science'
import type { StoredOutlookNote } from '../../shared/types/outlook-notes'
import type { StoredCause } from '../../shared/types/causes'
import type { OutlookHeadline, OutlookReleaseRef, StoredOutlookInput } from '../../shared/types/outlook'
import type { OutlookResult } from '../../shared/engine/types'
import type { GaugeRecord, GaugeValue } from '../../shared/observations/gauge-record'
import type { GaugeResolution, GaugeTrendFit } from '../../shared/observations/gauge-trend'
import type { LandDrawsSummary } from '../../shared/observations/land-motion-draws'
import type { BandsAtYear } from '../../shared/releases/summary'
import type { ReleaseParameters } from '../../shared/releases/parameters'
import type { BriefingDocument } from '../../shared/briefing/document'
import type { Staleness } from '../../shared/types/staleness'
import type { Language } from '../../shared/wording/chance'
import type { HeightUnit } from '../../shared/units'

export const roleEnum = pgEnum('role', ROLES)
export const organisationKindEnum = pgEnum('organisation_kind', ORGANISATION_KINDS)

export const organisations = pgTable('organisations', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull().unique(),
  kind: organisationKindEnum('kind').notNull(),
  // Demo organisations are invented; every screen that shows them says so.
  illustrative: boolean('illustrative').notNull().default(false),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
})

export const users = pgTable('users', {
  id: uuid('id').primaryKey().defaultRandom(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  passwordHash: text('password_hash').notNull(),
  role: roleEnum('role').notNull(),
  organisationId: uuid('organisation_id').notNull().references(() => organisations.id),
  locale: text('locale').notNull().default('en'),
  disabled: boolean('disabled').notNull().default(false),
  /**
   * Sessions carry the generation they were signed in under; raising it (sign-out, password
   * change or reset, disabling) ends every session of this user at once, wherever its cookie is.
   */
  sessionGeneration: integer('session_generation').notNull().default(0),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [index('users_organisation_idx').on(table.organisationId)])

export const auditLog = pgTable('audit_log', {
  id: integer('id').primaryKey().generatedAlwaysAsIdentity(),
  at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  actorId: uuid('actor_id').references(() => users.id),
  organisationId: uuid('organisation_id').references(() => organisations.id),
  action: text('action').notNull(),
  targetType: text('target_type').notNull(),
  targetId: text('target_id'),
  detail: jsonb('detail').$type<Record<string, unknown>>().notNull().default({}),
}, table => [index('audit_log_at_idx').on(table.at)])

// ---- Published science: series of releases, correlation sets, scale-factor grids ----

export const reviewStateEnum = pgEnum('review_state', REVIEW_STATES)
export const releaseFormEnum = pgEnum('release_form', RELEASE_FORMS)
export const amountUnitEnum = pgEnum('amount_unit', AMOUNT_UNITS)

const bytea = customType<{ data: Buffer, driverData: Buffer | Uint8Array }>({
  dataType: () => 'bytea',
  fromDriver: value => Buffer.isBuffer(value) ? value : Buffer.from(value),
})

/**
 * Columns every reviewed, versioned record carries: who wrote it, who approved it, where it is in
 * draft → in review → published → superseded / withdrawn, and when each step happened.
 */
const reviewed = () => ({
  organisationId: uuid('organisation_id').notNull().references(() => organisations.id),
  version: integer('version').notNull(),
  state: reviewStateEnum('state').notNull().default('draft'),
  method: text('method').notNull(),
  citation: text('citation').notNull(),
  doi: text('doi'),
  licence: text('licence').notNull(),
  authorId: uuid('author_id').notNull().references(() => users.id),
  /** Everyone else who changed this version's content: like the author, none of them may approve it. */
  coauthorIds: uuid('coauthor_ids').array().notNull().default(sql`'{}'::uuid[]`),
  reviewerId: uuid('reviewer_id').references(() => users.id),
  reviewNote: text('review_note'),
  withdrawalReason: text('withdrawal_reason'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  submittedAt: timestamp('submitted_at', { withTimezone: true }),
  publishedAt: timestamp('published_at', { withTimezone: true }),
  supersededAt: timestamp('superseded_at', { withTimezone: true }),
  withdrawnAt: timestamp('withdrawn_at', { withTimezone: true }),
})

/** A reviewed record not yet published: a draft or in review (for the one-per-series indexes). */
const UNPUBLISHED = sql`state in ('draft', 'in-review')`

export const series = pgTable('series', {
  id: uuid('id').primaryKey().defaultRandom(),
  component: text('component').notNull(),
  scenario: text('scenario').notNull(),
  organisationId: uuid('organisation_id').notNull().references(() => organisations.id),
  title: text('title').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [unique('series_identity').on(table.organisationId, table.component, table.scenario, table.title)])

export const releases = pgTable('releases', {
  id: uuid('id').primaryKey().defaultRandom(),
  seriesId: uuid('series_id').notNull().references(() => series.id),
  form: releaseFormEnum('form').notNull(),
  baselineYear: integer('baseline_year').notNull(),
  anchorYears: jsonb('anchor_years').$type<number[]>().notNull(),
  /** Form parameters in metres (draws live in release_draws). */
  parameters: jsonb('parameters').$type<ReleaseParameters>().notNull(),
  enteredUnit: amountUnitEnum('entered_unit').notNull().default('m'),
  /** Median and ranges at the anchor years, computed by the engine when saved. */
  summary: jsonb('summary').$type<BandsAtYear[]>().notNull(),
  ...reviewed(),
}, table => [
  unique('releases_series_version').on(table.seriesId, table.version),
  index('releases_state_idx').on(table.state),
  // At most one version of a series is a draft or in review. The services check first, with a message;
  // this catches two requests that both passed the check at the same moment.
  uniqueIndex('releases_one_unpublished').on(table.seriesId).where(UNPUBLISHED),
])

/** Uploaded draws, stored compactly: little-endian float64, draw-major (draws × anchor years). */
export const releaseDraws = pgTable('release_draws', {
  releaseId: uuid('release_id').primaryKey().references(() => releases.id, { onDelete: 'cascade' }),
  drawCount: integer('draw_count').notNull(),
  anchorCount: integer('anchor_count').notNull(),
  values: bytea('values').notNull(),
})

export const correlationSets = pgTable('correlation_sets', {
  id: uuid('id').primaryKey().defaultRandom(),
  scenario: text('scenario').notNull(),
  title: text('title').notNull(),
  components: jsonb('components').$type<string[]>().notNull(),
  matrix: jsonb('matrix').$type<number[][]>().notNull(),
  /**
   * The series (of releases) each component's correlations were estimated for: component → series id.
   * An outlook whose adopted series differ is warned (a note), not refused. A component absent here
   * had no published series when the set was drafted and is tied to none.
   */
  madeForSeries: jsonb('made_for_series').$type<Record<string, string>>().notNull().default({}),
  ...reviewed(),
}, table => [
  unique('correlation_sets_version').on(table.organisationId, table.scenario, table.version),
  uniqueIndex('correlation_sets_one_unpublished').on(table.organisationId, table.scenario).where(UNPUBLISHED),
])

/**
 * A high-end storyline: a named set of component values (metres of global-mean rise from its baseline
 * year, per anchor year), e.g. a plausible ice-sheet instability case. Reviewed and versioned like a
 * release, one series per (organisation, scenario, name); shown beside an outlook's chances and never
 * sampled, so publishing one changes no outlook.
 */
export const storylines = pgTable('storylines', {
  id: uuid('id').primaryKey().defaultRandom(),
  scenario: text('scenario').notNull(),
  name: text('name').notNull(),
  description: text('description').notNull(),
  baselineYear: integer('baseline_year').notNull(),
  anchorYears: jsonb('anchor_years').$type<number[]>().notNull(),
  /** Per component it names: metres at each anchor year. Components it does not name stay at their middle estimate. */
  values: jsonb('values').$type<Record<string, number[]>>().notNull(),
  ...reviewed(),
}, table => [
  unique('storylines_version').on(table.organisationId, table.scenario, table.name, table.version),
  uniqueIndex('storylines_one_unpublished').on(table.organisationId, table.scenario, table.name).where(UNPUBLISHED),
])

export const scaleFactorGrids = pgTable('scale_factor_grids', {
  id: uuid('id').primaryKey().defaultRandom(),
  component: text('component').notNull(),
  title: text('title').notNull(),
  latitudes: jsonb('latitudes').$type<number[]>().notNull(),
  longitudes: jsonb('longitudes').$type<number[]>().notNull(),
  /** factors[i][j] at latitudes[i], longitudes[j]. */
  factors: jsonb('factors').$type<number[][]>().notNull(),
  ...reviewed(),
}, table => [
  unique('scale_factor_grids_version').on(table.organisationId, table.component, table.version),
  uniqueIndex('scale_factor_grids_one_unpublished').on(table.organisationId, table.component).where(UNPUBLISHED),
])

// ---- The science an organisation adopted for its outlooks ----

/**
 * Which series of each component an organisation's outlooks use, per scenario. New versions in an
 * adopted series flow in; another series is offered, never applied, until someone adopts it.
 * `adoptedBy` is null when the system adopted it (first outlook of the scenario, or the backfill).
 */
export const seriesAdoptions = pgTable('series_adoptions', {
  organisationId: uuid('organisation_id').notNull().references(() => organisations.id),
  scenario: text('scenario').notNull(),
  component: text('component').notNull(),
  seriesId: uuid('series_id').notNull().references(() => series.id),
  adoptedBy: uuid('adopted_by').references(() => users.id),
  adoptedAt: timestamp('adopted_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [
  primaryKey({ name: 'series_adoptions_pk', columns: [table.organisationId, table.scenario, table.component] }),
  // A new version or a withdrawal in a series reaches the organisations that adopted it.
  index('series_adoptions_series_idx').on(table.seriesId),
])

/**
 * Whose correlation sets an organisation's outlooks use for a scenario: the latest published version
 * from `sourceOrganisationId` (a correlation set's series is its organisation and scenario), or none
 * (null: the components are treated as independent, and the outlook says so).
 */
export const correlationAdoptions = pgTable('correlation_adoptions', {
  organisationId: uuid('organisation_id').notNull().references(() => organisations.id),
  scenario: text('scenario').notNull(),
  sourceOrganisationId: uuid('source_organisation_id').references(() => organisations.id),
  adoptedBy: uuid('adopted_by').references(() => users.id),
  adoptedAt: timestamp('adopted_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [primaryKey({ name: 'correlation_adoptions_pk', columns: [table.organisationId, table.scenario] })])

// ---- Coastal sites and their outlooks ----

export const landMotionSourceEnum = pgEnum('land_motion_source', LAND_MOTION_SOURCES)
export const outlookStateEnum = pgEnum('outlook_state', OUTLOOK_STATES)
export const datumKindEnum = pgEnum('datum_kind', DATUM_KINDS)
export const thresholdKindEnum = pgEnum('threshold_kind', THRESHOLD_KINDS)

export const sites = pgTable(
  'sites',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisations.id),
    name: text('name').notNull(),
    latitude: doublePrecision('latitude').notNull(),
    longitude: doublePrecision('longitude').notNull(),
    /** The datum every height here is measured above, by name in the planner's words. */
    referenceLevel: text('reference_level').notNull(),
    datumKind: datumKindEnum('datum_kind').notNull(),
    /** Mean sea level at the reference epoch, metres above the datum (0 when the datum is that mean sea level). */
    datumOffset: doublePrecision('datum_offset').notNull(),
    /** The year rise is counted from: fixed per site, never the calendar year. */
    referenceEpoch: integer('reference_epoch').notNull(),
    /** mm/yr, negative = sinking (which adds to local rise). */
    landMotionRate: doublePrecision('land_motion_rate').notNull(),
    landMotionSigma: doublePrecision('land_motion_sigma').notNull(),
    landMotionSource: landMotionSourceEnum('land_motion_source').notNull(),
    landMotionReference: text('land_motion_reference').notNull().default(''),
    landMotionEpoch: integer('land_motion_epoch').notNull(),
    /** The scenario its planners plan for: lists, the map and mails give the headline chance under this one. */
    planningScenario: text('planning_scenario').notNull().default('SSP2-4.5'),
    /** The chance its planners accept of a threshold being passed (one of the engine's trigger tolerances). */
    planningTolerance: doublePrecision('planning_tolerance').notNull().default(0.1),
    /**
     * Gumbel statistics of annual maximum water level: location at the reference epoch and scale, metres above the
     * datum.
     */
    gumbelLocation: doublePrecision('gumbel_location'),
    gumbelScale: doublePrecision('gumbel_scale'),
    /** From a fit of annual maxima: how fast the location moved (m/yr), and standard errors of the three. */
    gumbelTrend: doublePrecision('gumbel_trend'),
    gumbelLocationSe: doublePrecision('gumbel_location_se'),
    gumbelScaleSe: doublePrecision('gumbel_scale_se'),
    gumbelTrendSe: doublePrecision('gumbel_trend_se'),
    /** 'entered', or the number of annual maxima the fit used. */
    gumbelSource: text('gumbel_source'),
    createdBy: uuid('created_by')
      .notNull()
      .references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  table => [index('sites_organisation_idx').on(table.organisationId)],
)

export const thresholds = pgTable('thresholds', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  label: text('label').notNull(),
  /** Metres above the site's datum. */
  height: doublePrecision('height').notNull(),
  kind: thresholdKindEnum('kind').notNull().default('mean-sea-level'),
  /** Flood levels only: the asset's first year of service and its life in years. */
  buildYear: integer('build_year'),
  designLifeYears: integer('design_life_years'),
  position: integer('position').notNull().default(0),
}, table => [index('thresholds_site_idx').on(table.siteId)])

export const annualMaxima = pgTable('annual_maxima', {
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  year: integer('year').notNull(),
  value: doublePrecision('value').notNull(),
}, table => [unique('annual_maxima_site_year').on(table.siteId, table.year)])

/**
 * A site's tide-gauge record of mean sea level, versioned: each upload is a new version and the latest is
 * the one shown. Values are as uploaded (metres above the site's datum); the fit is stored with them so a
 * page never refits, and `fitIssue` says why there is no fit (a record too short to fit is still kept).
 */
export const gaugeRecords = pgTable('gauge_records', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  version: integer('version').notNull(),
  resolution: text('resolution').$type<GaugeResolution>().notNull(),
  values: jsonb('values').$type<GaugeValue[]>().notNull(),
  gaps: jsonb('gaps').$type<GaugeRecord['gaps']>().notNull(),
  fit: jsonb('fit').$type<GaugeTrendFit>(),
  fitIssue: text('fit_issue'),
  uploadedBy: uuid('uploaded_by').references(() => users.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [unique('gauge_records_site_version').on(table.siteId, table.version)])

/**
 * A site's land motion as posterior draws of its rate (mm/yr, in draw order), versioned like the gauge
 * record: an upload is a new row, the latest is what outlooks use. `linkedReleaseId`: a release of draws
 * (same count) that the land draws are joint with, draw j with draw j.
 */
export const landMotionDraws = pgTable('land_motion_draws', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  version: integer('version').notNull(),
  draws: jsonb('draws').$type<number[]>().notNull(),
  summary: jsonb('summary').$type<LandDrawsSummary>().notNull(),
  source: landMotionSourceEnum('source').notNull(),
  reference: text('reference').notNull().default(''),
  linkedReleaseId: uuid('linked_release_id').references(() => releases.id),
  uploadedBy: uuid('uploaded_by').references(() => users.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [unique('land_motion_draws_site_version').on(table.siteId, table.version)])

export const outlooks = pgTable('outlooks', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  scenario: text('scenario').notNull(),
  samples: integer('samples').notNull(),
  seed: integer('seed').notNull(),
  /** SHA-256 of the engine input and engine version: same hash, same numbers. */
  inputHash: text('input_hash').notNull(),
  engineVersion: text('engine_version').notNull(),
  state: outlookStateEnum('state').notNull().default('running'),
  /** Everything needed to reproduce the run: the engine input as sent. */
  input: jsonb('input').$type<StoredOutlookInput>().notNull(),
  releaseRefs: jsonb('release_refs').$type<OutlookReleaseRef[]>().notNull(),
  correlationSetId: uuid('correlation_set_id').references(() => correlationSets.id),
  notes: jsonb('notes').$type<StoredOutlookNote[]>().notNull().default([]),
  result: jsonb('result').$type<OutlookResult>(),
  headline: jsonb('headline').$type<OutlookHeadline>(),
  error: text('error'),
  durationMs: integer('duration_ms'),
  /** Who asked; null when the system recomputed it after a change in the science or the site. */
  requestedBy: uuid('requested_by').references(() => users.id),
  // A running outlook is also its own job: an app instance claims it by taking the lease (row lock
  // with SKIP LOCKED), renews the lease while it computes, and writes the result only while it
  // still holds it. A lease that runs out (the instance died) lets another instance take over.
  claimedBy: text('claimed_by'),
  /** When an instance last took it: the queue serves the organisation served longest ago first. */
  claimedAt: timestamp('claimed_at', { withTimezone: true }),
  leaseUntil: timestamp('lease_until', { withTimezone: true }),
  attempts: integer('attempts').notNull().default(0),
  /** Share of the samples drawn so far (0–1), while running. */
  progress: doublePrecision('progress'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
}, table => [
  unique('outlooks_site_input').on(table.siteId, table.inputHash),
  index('outlooks_site_idx').on(table.siteId),
  index('outlooks_state_idx').on(table.state),
])

// ---- Briefings ----

export const briefingStateEnum = pgEnum('briefing_state', ['draft', 'issued'])

export const briefings = pgTable(
  'briefings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisations.id),
    siteId: uuid('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    /** The outlook it is issued from, then those compared with it (other scenarios). */
    outlookIds: jsonb('outlook_ids').$type<string[]>().notNull(),
    version: integer('version').notNull().default(1),
    previousId: uuid('previous_id'),
    state: briefingStateEnum('state').notNull().default('draft'),
    title: text('title').notNull(),
    audience: text('audience').notNull().default(''),
    localContext: text('local_context').notNull().default(''),
    language: text('language').$type<Language>().notNull(),
    units: text('units').$type<HeightUnit>().notNull(),
    thresholdIds: jsonb('threshold_ids').$type<string[]>().notNull(),
    years: jsonb('years').$type<number[]>().notNull(),
    /** Whether the document has the site's adaptation pathways and decision records (frozen with it). */
    includePathways: boolean('include_pathways').notNull().default(false),
    /** The frozen document (shared/briefing/document.ts), written when issued. */
    document: jsonb('document').$type<BriefingDocument>(),
    /**
     * What newer outlooks of its site change in an issued briefing, worked out whenever one of them
     * finishes (server/services/briefing-staleness.ts); null while it is current.
     */
    staleness: jsonb('staleness').$type<Staleness>(),
    /** When `staleness` was last worked out: a shared page rendered before then is rendered again. */
    stalenessCheckedAt: timestamp('staleness_checked_at', { withTimezone: true }),
    shareToken: text('share_token').unique(),
    createdBy: uuid('created_by')
      .notNull()
      .references(() => users.id),
    issuedBy: uuid('issued_by').references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    issuedAt: timestamp('issued_at', { withTimezone: true }),
  },
  table => [index('briefings_site_idx').on(table.siteId), index('briefings_organisation_idx').on(table.organisationId)],
)

// ---- Mail: the outbox, the local stand-in's mailbox, watches, invitations, password resets ----

export const outboxStateEnum = pgEnum('outbox_state', ['queued', 'sent', 'failed'])

/** Every e-mail goes through here, queued in the transaction of the change that caused it. */
export const mailOutbox = pgTable('mail_outbox', {
  id: uuid('id').primaryKey().defaultRandom(),
  to: text('to').notNull(),
  subject: text('subject').notNull(),
  text: text('text').notNull(),
  html: text('html').notNull(),
  headers: jsonb('headers').$type<Record<string, string>>().notNull().default({}),
  /** What caused it, e.g. `watch-confirm:<watch id>`; one message per key. */
  dedupeKey: text('dedupe_key').unique(),
  state: outboxStateEnum('state').notNull().default('queued'),
  attempts: integer('attempts').notNull().default(0),
  lastError: text('last_error'),
  nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
  /** Held by a sender until then, so two senders never send one message twice. */
  lockedUntil: timestamp('locked_until', { withTimezone: true }),
  messageId: text('message_id'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  sentAt: timestamp('sent_at', { withTimezone: true }),
}, table => [index('mail_outbox_due_idx').on(table.state, table.nextAttemptAt)])

/** Messages received by the local stand-in SMTP server (when no SMTP_URL is set). */
export const mailbox = pgTable('mailbox', {
  id: uuid('id').primaryKey().defaultRandom(),
  receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  envelopeFrom: text('envelope_from').notNull(),
  envelopeTo: jsonb('envelope_to').$type<string[]>().notNull(),
  raw: text('raw').notNull(),
})

export const watchStateEnum = pgEnum('watch_state', ['pending', 'active', 'unsubscribed'])

export const watches = pgTable('watches', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  email: text('email').notNull(),
  language: text('language').notNull().default('en'),
  state: watchStateEnum('state').notNull().default('pending'),
  /** SHA-256 of the confirmation token; the token itself only travels in the e-mail. */
  confirmTokenHash: text('confirm_token_hash'),
  confirmExpiresAt: timestamp('confirm_expires_at', { withTimezone: true }),
  unsubscribeToken: text('unsubscribe_token').notNull().unique(),
  userId: uuid('user_id').references(() => users.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  confirmedAt: timestamp('confirmed_at', { withTimezone: true }),
  unsubscribedAt: timestamp('unsubscribed_at', { withTimezone: true }),
  /**
   * Set when the watch was started from a shared briefing's link: it then sees only what that
   * briefing showed (its thresholds, scenarios and years) and ends when the link is revoked.
   */
  briefingId: uuid('briefing_id').references(() => briefings.id, { onDelete: 'cascade' }),
  /** Why a watch stopped other than by its owner: `share-revoked`. */
  endedReason: text('ended_reason'),
  /** When the mail server refused the address permanently (5xx); nothing more is sent to it. */
  undeliverableAt: timestamp('undeliverable_at', { withTimezone: true }),
}, table => [unique('watches_site_email').on(table.siteId, table.email)])

/** A single-use, expiring token sent by e-mail: invitations and password resets. */
export const accountTokens = pgTable('account_tokens', {
  id: uuid('id').primaryKey().defaultRandom(),
  kind: text('kind').notNull(),
  tokenHash: text('token_hash').notNull().unique(),
  email: text('email').notNull(),
  userId: uuid('user_id').references(() => users.id),
  role: roleEnum('role'),
  organisationId: uuid('organisation_id').references(() => organisations.id),
  name: text('name'),
  invitedBy: uuid('invited_by').references(() => users.id),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
})

// ---- Background work ----

/** A recomputation of many sites at once (after new science, or asked for by an administrator). */
export const recomputations = pgTable('recomputations', {
  id: uuid('id').primaryKey().defaultRandom(),
  /** The scenario whose outlooks are recomputed; null for every scenario. */
  scenario: text('scenario'),
  /** Why, in each language: the first line of the "what changed" e-mail. */
  cause: jsonb('cause').$type<StoredCause>().notNull(),
  requestedBy: uuid('requested_by').references(() => users.id),
  siteCount: integer('site_count').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
})

export const jobStateEnum = pgEnum('job_state', ['queued', 'running', 'done', 'failed'])

/**
 * Durable background work, claimed by any app instance under a lease (SKIP LOCKED), so a job runs
 * once even with several instances and survives a restart. Written in the same transaction as
 * the change that causes it.
 */
export const jobs = pgTable('jobs', {
  id: uuid('id').primaryKey().defaultRandom(),
  kind: text('kind').notNull(),
  payload: jsonb('payload').$type<Record<string, unknown>>().notNull(),
  recomputationId: uuid('recomputation_id').references(() => recomputations.id, { onDelete: 'cascade' }),
  state: jobStateEnum('state').notNull().default('queued'),
  attempts: integer('attempts').notNull().default(0),
  runAfter: timestamp('run_after', { withTimezone: true }).notNull().defaultNow(),
  claimedBy: text('claimed_by'),
  leaseUntil: timestamp('lease_until', { withTimezone: true }),
  error: text('error'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  finishedAt: timestamp('finished_at', { withTimezone: true }),
}, table => [
  index('jobs_due_idx').on(table.state, table.runAfter),
  index('jobs_recomputation_idx').on(table.recomputationId),
])

/**
 * Fixed-window counts for rate limits (failed sign-ins, public writes), kept in the database so that
 * every app instance counts against the same limit. Ended windows are swept now and then.
 */
export const rateWindows = pgTable('rate_windows', {
  key: text('key').primaryKey(),
  count: integer('count').notNull(),
  resetAt: timestamp('reset_at', { withTimezone: true }).notNull(),
}, table => [
  index('rate_windows_reset_idx').on(table.resetAt),
])

// Adaptation pathways, measures, decision records and alerts.
export * from './schema-pathways'
