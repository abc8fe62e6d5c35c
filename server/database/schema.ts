import { sql } from 'drizzle-orm'
import {
  bigserial,
  boolean,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core'

// Timestamps are kept with time zone; the app reads and writes them as JS Dates (UTC).
const createdAt = timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()
const updatedAt = timestamp('updated_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow()

export const roleEnum = pgEnum('role', ['scientist', 'witness', 'compliance', 'admin'])

/**
 * Entry states. `draft` can be edited; `awaiting_witness` is signed by its author;
 * `witnessed` carries a countersignature; `declined` was refused by the witness;
 * `superseded` was replaced by an amendment.
 */
export const entryStateEnum = pgEnum('entry_state', [
  'draft',
  'awaiting_witness',
  'witnessed',
  'declined',
  'superseded',
])

export const people = pgTable('people', {
  id: uuid('id').primaryKey().defaultRandom(),
  email: text('email').notNull(),
  name: text('name').notNull(),
  passwordHash: text('password_hash'),
  disabled: boolean('disabled').notNull().default(false),
  createdAt,
  updatedAt,
}, table => [uniqueIndex('people_email_unique').on(sql`lower(${table.email})`)])

export const personRoles = pgTable('person_roles', {
  personId: uuid('person_id').notNull().references(() => people.id),
  role: roleEnum('role').notNull(),
  grantedAt: timestamp('granted_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
}, table => [primaryKey({ columns: [table.personId, table.role] })])

export const notebooks = pgTable('notebooks', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  description: text('description').notNull().default(''),
  createdBy: uuid('created_by').references(() => people.id),
  createdAt,
  updatedAt,
}, table => [uniqueIndex('notebooks_name_unique').on(sql`lower(${table.name})`)])

export const notebookMembers = pgTable('notebook_members', {
  notebookId: uuid('notebook_id').notNull().references(() => notebooks.id),
  personId: uuid('person_id').notNull().references(() => people.id),
  addedAt: timestamp('added_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
}, table => [
  primaryKey({ columns: [table.notebookId, table.personId] }),
  index('notebook_members_person').on(table.personId),
])

/**
 * An entry is the working copy a scientist edits. `version` counts its versions: a signed
 * version is frozen into `entry_versions` (later issue) and an amendment starts version + 1,
 * naming the version it supersedes. `lockVersion` guards concurrent edits (optimistic
 * concurrency: a save names the lock version it started from).
 */
export const entries = pgTable('entries', {
  id: uuid('id').primaryKey().defaultRandom(),
  notebookId: uuid('notebook_id').notNull().references(() => notebooks.id),
  authorId: uuid('author_id').notNull().references(() => people.id),
  title: text('title').notNull(),
  content: jsonb('content').notNull(),
  state: entryStateEnum('state').notNull().default('draft'),
  version: integer('version').notNull().default(1),
  supersedesVersion: integer('supersedes_version'),
  lockVersion: integer('lock_version').notNull().default(1),
  createdAt,
  updatedAt,
}, table => [
  index('entries_notebook_updated').on(table.notebookId, table.updatedAt),
  index('entries_author').on(table.authorId),
])

/**
 * Append-only, hash-chained audit trail. Each row stores the hash of the row before it
 * (`previousHash`) and its own (`hash`, SHA-256 of the row's canonical JSON). A trigger
 * refuses UPDATE, DELETE and TRUNCATE (see the migration).
 */
export const auditEvents = pgTable('audit_events', {
  sequence: bigserial('sequence', { mode: 'number' }).primaryKey(),
  occurredAt: timestamp('occurred_at', { withTimezone: true, mode: 'date' }).notNull(),
  actorId: uuid('actor_id'),
  actorEmail: text('actor_email'),
  action: text('action').notNull(),
  subjectType: text('subject_type'),
  subjectId: text('subject_id'),
  details: jsonb('details').notNull(),
  previousHash: text('previous_hash').notNull(),
  hash: text('hash').notNull(),
}, table => [
  index('audit_events_subject').on(table.subjectType, table.subjectId),
  index('audit_events_action').on(table.action),
  index('audit_events_occurred').on(table.occurredAt),
])

/**
 * Failed sign-ins per key (e-mail and client address), kept in the database so that
 * throttling holds across stateless app servers.
 */
export const signInThrottle = pgTable('sign_in_throttle', {
  key: text('key').primaryKey(),
  failures: integer('failures').notNull().default(0),
  windowStartedAt: timestamp('window_started_at', { withTimezone: true, mode: 'date' }).notNull(),
  lockedUntil: timestamp('locked_until', { withTimezone: true, mode: 'date' }),
})

export type Person = typeof people.$inferSelect
export type Notebook = typeof notebooks.$inferSelect
export type Entry = typeof entries.$inferSelect
export type AuditEvent = typeof auditEvents.$inferSelect
export type Role = (typeof roleEnum.enumValues)[number]
export type EntryState = (typeof entryStateEnum.enumValues)[number]
