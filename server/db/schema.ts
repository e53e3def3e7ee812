import { boolean, customType, index, integer, jsonb, pgEnum, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core'
import { ORGANISATION_KINDS, ROLES } from '../../shared/types/roles'
import { AMOUNT_UNITS, RELEASE_FORMS, REVIEW_STATES } from '../../shared/types/science'

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

export const series = pgTable('series', {
  id: uuid('id').primaryKey().defaultRandom(),
  component: text('component').notNull(),
  scenario: text('scenario').notNull(),
  organisationId: uuid('organisation_id').notNull().references(() => organisations.id),
  title: text('title').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [unique('series_identity').on(table.organisationId, table.component, table.scenario, table.title)])

export interface ReleaseSummaryAnchor { year: number, p5: number, p17: number, p50: number, p83: number, p95: number }

export const releases = pgTable('releases', {
  id: uuid('id').primaryKey().defaultRandom(),
  seriesId: uuid('series_id').notNull().references(() => series.id),
  form: releaseFormEnum('form').notNull(),
  baselineYear: integer('baseline_year').notNull(),
  anchorYears: jsonb('anchor_years').$type<number[]>().notNull(),
  /** Form parameters in metres (draws live in release_draws). */
  parameters: jsonb('parameters').$type<Record<string, unknown>>().notNull(),
  enteredUnit: amountUnitEnum('entered_unit').notNull().default('m'),
  /** Median and ranges at the anchor years, computed by the engine when saved. */
  summary: jsonb('summary').$type<ReleaseSummaryAnchor[]>().notNull(),
  ...reviewed(),
}, table => [
  unique('releases_series_version').on(table.seriesId, table.version),
  index('releases_state_idx').on(table.state),
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
  ...reviewed(),
}, table => [unique('correlation_sets_version').on(table.organisationId, table.scenario, table.version)])

export const scaleFactorGrids = pgTable('scale_factor_grids', {
  id: uuid('id').primaryKey().defaultRandom(),
  component: text('component').notNull(),
  title: text('title').notNull(),
  latitudes: jsonb('latitudes').$type<number[]>().notNull(),
  longitudes: jsonb('longitudes').$type<number[]>().notNull(),
  /** factors[i][j] at latitudes[i], longitudes[j]. */
  factors: jsonb('factors').$type<number[][]>().notNull(),
  ...reviewed(),
}, table => [unique('scale_factor_grids_version').on(table.organisationId, table.component, table.version)])
