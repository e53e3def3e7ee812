import {
  boolean,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  text,
  timestamp,
  unique,
  uuid,
} from 'drizzle-orm/pg-core'
import type { ThresholdKind } from '../../shared/types/science'
import type { MeasureChances, MeasureHeight } from '../../shared/pathways/evaluate-measures'
import { outlooks, sites, users } from './schema'

// Adaptation pathways: a site's measures, the sequences they form, the decisions a council records
// and the alerts raised when new science moves one. Only lazy references to schema.ts (the two files
// import each other).

export const adaptationMeasures = pgTable('adaptation_measures', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  /** Metres above the site's datum; null for a measure that does not depend on a height (managed retreat). */
  height: doublePrecision('height'),
  kind: text('kind').$type<ThresholdKind>().notNull(),
  leadTimeYears: integer('lead_time_years').notNull(),
  designLifeYears: integer('design_life_years'),
  costBand: text('cost_band'),
  createdBy: uuid('created_by').notNull().references(() => users.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [index('adaptation_measures_site_idx').on(table.siteId)])

export const adaptationPathways = pgTable('adaptation_pathways', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  name: text('name').notNull(),
  /** Measure ids in the order they follow one another. */
  measureIds: jsonb('measure_ids').$type<string[]>().notNull(),
  tolerances: jsonb('tolerances').$type<number[]>().notNull(),
  /** Invented demo content, labelled as such wherever it is shown. */
  illustrative: boolean('illustrative').notNull().default(false),
  createdBy: uuid('created_by').notNull().references(() => users.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
}, table => [index('adaptation_pathways_site_idx').on(table.siteId)])

export interface RecordedRelease {
  component: string
  releaseId: string
  seriesId: string
  version: number
  citation: string
}

/** What a council decided and the outlook it rested on. Never updated: a review is a new record. */
export const decisionRecords = pgTable('decision_records', {
  id: uuid('id').primaryKey().defaultRandom(),
  siteId: uuid('site_id').notNull().references(() => sites.id, { onDelete: 'cascade' }),
  pathwayId: uuid('pathway_id').notNull().references(() => adaptationPathways.id, { onDelete: 'cascade' }),
  /** The measure decided on and the one in service until it tips. */
  measureId: uuid('measure_id').notNull().references(() => adaptationMeasures.id, { onDelete: 'cascade' }),
  fromMeasureId: uuid('from_measure_id').notNull().references(() => adaptationMeasures.id, { onDelete: 'cascade' }),
  scenario: text('scenario').notNull(),
  tolerance: doublePrecision('tolerance').notNull(),
  /** The adopted value: the year the measure in service tips; null when not by the horizon. */
  tippingYear: integer('tipping_year'),
  decisionYear: integer('decision_year'),
  horizon: integer('horizon').notNull(),
  leadTimeYears: integer('lead_time_years').notNull(),
  marginYears: integer('margin_years').notNull(),
  rationale: text('rationale').notNull(),
  // No foreign key: a record keeps naming its outlook whatever happens to it.
  outlookId: uuid('outlook_id').notNull(),
  outlookInputHash: text('outlook_input_hash').notNull(),
  engineVersion: text('engine_version').notNull(),
  releases: jsonb('releases').$type<RecordedRelease[]>().notNull(),
  decidedBy: uuid('decided_by').notNull().references(() => users.id),
  decidedByName: text('decided_by_name').notNull(),
  decidedAt: timestamp('decided_at', { withTimezone: true }).notNull().defaultNow(),
  /** YYYY-MM-DD. */
  reviewDate: text('review_date').notNull(),
  /** Set when this record reviews an earlier one (which clears that one's alerts). */
  reviewsRecordId: uuid('reviews_record_id'),
}, table => [index('decision_records_site_idx').on(table.siteId)])

export interface AlertReason {
  /** 'late': the tipping year now falls before today + lead time; 'moved': it moved by more than the margin. */
  kinds: Array<'late' | 'moved'>
  tippingYear: number | null
  decisionYear: number | null
  releases: Array<{ component: string, from: number | null, to: number, citation: string }>
}

/** New science moved a recorded decision; open until a later record reviews it. */
export const decisionAlerts = pgTable(
  'decision_alerts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    recordId: uuid('record_id')
      .notNull()
      .references(() => decisionRecords.id, { onDelete: 'cascade' }),
    siteId: uuid('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    /** The outlook whose science raised it: one alert per record and outlook. */
    outlookId: uuid('outlook_id').notNull(),
    reason: jsonb('reason').$type<AlertReason>().notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  table => [
    unique('decision_alerts_record_outlook').on(table.recordId, table.outlookId),
    index('decision_alerts_site_idx').on(table.siteId),
  ],
)

export type TippingEvaluationState = 'running' | 'done' | 'failed'

/**
 * Each measure's chance of being exceeded in every year under one outlook's trajectories, computed
 * on the outlook worker pool when the outlook finishes or the site's measures change
 * (server/services/pathways/evaluation.ts); tipping years at any tolerance are read from it.
 * `measuresKey` names the measures' heights (and the engine), so a changed measure asks for a new row.
 */
export const tippingEvaluations = pgTable(
  'tipping_evaluations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    outlookId: uuid('outlook_id')
      .notNull()
      .references(() => outlooks.id, { onDelete: 'cascade' }),
    siteId: uuid('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
    measuresKey: text('measures_key').notNull(),
    /** The measures evaluated, heights in metres above mean sea level at the outlook's epoch. */
    heights: jsonb('heights').$type<MeasureHeight[]>().notNull(),
    state: text('state').$type<TippingEvaluationState>().notNull().default('running'),
    horizon: integer('horizon'),
    chances: jsonb('chances').$type<MeasureChances[]>(),
    error: text('error'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  table => [
    unique('tipping_evaluations_outlook_measures').on(table.outlookId, table.measuresKey),
    index('tipping_evaluations_site_idx').on(table.siteId),
  ],
)
