import { boolean, index, integer, jsonb, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core'
import { ORGANISATION_KINDS, ROLES } from '../../shared/types/roles'

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
