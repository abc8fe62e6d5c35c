import { sql } from 'drizzle-orm'
import {
  bigint,
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


export const people = pgTable('people', {
  id: uuid('id').primaryKey().defaultRandom(),
  email: text('email').notNull(),
  name: text('name').notNull(),
  passwordHash: text('password_hash'),
  disabled: boolean('disabled').notNull().default(false),
  /**
   * Session epoch: every session cookie carries the epoch it was issued under, and a session
   * whose epoch is not the person's current one is refused (server/utils/auth.ts). Sign-out and
   * a password change add one, which ends every session of that person on every app server.
   */
  sessionEpoch: integer('session_epoch').notNull().default(0),
  createdAt,
  updatedAt,
}, table => [uniqueIndex('people_email_unique').on(sql`lower(${table.email})`)])

/**
 * One-time password reset links. Administrators never set a password: they have a link mailed
 * to the person, who sets it. Only the SHA-256 of the link's token is stored; a link works once,
 * until `expiresAt`, and a newer link (or a use) closes every older one.
 */
export const passwordResets = pgTable('password_resets', {
  id: uuid('id').primaryKey().defaultRandom(),
  personId: uuid('person_id').notNull().references(() => people.id),
  tokenHash: text('token_hash').notNull(),
  requestedBy: uuid('requested_by').references(() => people.id),
  createdAt,
  expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true, mode: 'date' }),
}, table => [
  uniqueIndex('password_resets_token').on(table.tokenHash),
  index('password_resets_person').on(table.personId),
])

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
 * version is frozen into `entry_versions` and an amendment starts version + 1, naming the
 * version it supersedes. Its state is not stored: it is derived from the frozen tables
 * (shared/records/lifecycle.ts, server/utils/lifecycle.ts). `lockVersion` guards concurrent edits (optimistic
 * concurrency: a save names the lock version it started from).
 */
export const entries = pgTable('entries', {
  id: uuid('id').primaryKey().defaultRandom(),
  notebookId: uuid('notebook_id').notNull().references(() => notebooks.id),
  authorId: uuid('author_id').notNull().references(() => people.id),
  title: text('title').notNull(),
  content: jsonb('content').notNull(),
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
 * Signed tree heads of the audit log (RFC 9162 §2.1): the Merkle root of its first `treeSize`
 * events, signed with the records key (kept outside the database). `payload` and `signature`
 * are the records-key document as published; frozen like the log itself.
 */
export const auditCheckpoints = pgTable('audit_checkpoints', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  treeSize: integer('tree_size').notNull(),
  /** audit_events.sequence of the last event covered. */
  lastSequence: bigint('last_sequence', { mode: 'number' }).notNull(),
  rootHash: text('root_hash').notNull(),
  signedAt: timestamp('signed_at', { withTimezone: true, mode: 'date' }).notNull(),
  /** The records key's raw public key, base64 (the payload names its fingerprint). */
  recordsKey: text('records_key').notNull(),
  payload: text('payload').notNull(),
  signature: text('signature').notNull(),
}, table => [index('audit_checkpoints_size').on(table.treeSize)])

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

/**
 * The open editing session of a draft: autosaves are counted here, not each audited. The
 * session becomes one `entry_edited` audit event (saves, first and last content hash) when it
 * closes: at a save more than five minutes after the one before, when any other event about the
 * entry is audited (signing, a data file attached), or by the idle sweep (server/utils/editSessions.ts).
 * The row is deleted as its event is appended; audit rows themselves are never updated.
 */
export const entryEditSessions = pgTable('entry_edit_sessions', {
  entryId: uuid('entry_id').primaryKey().references(() => entries.id),
  personId: uuid('person_id').notNull().references(() => people.id),
  personEmail: text('person_email').notNull(),
  version: integer('version').notNull(),
  // Milliseconds, as a JS Date holds them: the close compares the start time it read.
  startedAt: timestamp('started_at', { withTimezone: true, mode: 'date', precision: 3 }).notNull(),
  lastSavedAt: timestamp('last_saved_at', { withTimezone: true, mode: 'date', precision: 3 }).notNull(),
  saves: integer('saves').notNull(),
  firstLockVersion: integer('first_lock_version').notNull(),
  lastLockVersion: integer('last_lock_version').notNull(),
  /** SHA-256 of the canonical JSON of { title, content } after the session's first and last save. */
  firstContentHash: text('first_content_hash').notNull(),
  lastContentHash: text('last_content_hash').notNull(),
  titleChanged: boolean('title_changed').notNull().default(false),
}, table => [index('entry_edit_sessions_last_saved').on(table.lastSavedAt)])

/**
 * How a person reads numbers on the page: significant figures and display units. A null column
 * means the default (six figures; the units the presentation uses by default). The record PDF
 * and the signed record never use these (full precision, SI and stated units).
 */
export const personPreferences = pgTable('person_preferences', {
  personId: uuid('person_id').primaryKey().references(() => people.id),
  significantFigures: integer('significant_figures'),
  energyUnit: text('energy_unit'),
  pressureUnit: text('pressure_unit'),
  temperatureUnit: text('temperature_unit'),
  updatedAt,
})

export type Person = typeof people.$inferSelect
export type Notebook = typeof notebooks.$inferSelect
export type Entry = typeof entries.$inferSelect
export type AuditEvent = typeof auditEvents.$inferSelect
export type EntryEditSession = typeof entryEditSessions.$inferSelect
export type PersonPreferences = typeof personPreferences.$inferSelect
export type AuditCheckpoint = typeof auditCheckpoints.$inferSelect
export type Role = (typeof roleEnum.enumValues)[number]

// ---------------------------------------------------------------------------------------
// Signed records (issue: signatures), data files, exports and integration tokens.
// Frozen rows (versions, signatures, keys) are guarded by triggers in the migrations.

export const signingMeaningEnum = pgEnum('signing_meaning', ['authored', 'witnessed', 'reviewed'])

/** A data file attached to an entry. Bytes live in Nitro storage under `storageKey`. */
export const attachments = pgTable('attachments', {
  id: uuid('id').primaryKey().defaultRandom(),
  entryId: uuid('entry_id').notNull().references(() => entries.id),
  name: text('name').notNull(),
  storageKey: text('storage_key').notNull(),
  mediaType: text('media_type').notNull(),
  size: integer('size').notNull(),
  sha256: text('sha256').notNull(),
  uploadedBy: uuid('uploaded_by').notNull().references(() => people.id),
  uploadedAt: timestamp('uploaded_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  /** Set when a draft's author removes the file; a file in a signed version stays. */
  detachedAt: timestamp('detached_at', { withTimezone: true, mode: 'date' }),
}, table => [index('attachments_entry').on(table.entryId)])

/** A frozen version of an entry: exactly what was signed. Never updated or deleted. */
export const entryVersions = pgTable('entry_versions', {
  id: uuid('id').primaryKey().defaultRandom(),
  entryId: uuid('entry_id').notNull().references(() => entries.id),
  version: integer('version').notNull(),
  supersedesVersion: integer('supersedes_version'),
  title: text('title').notNull(),
  content: jsonb('content').notNull(),
  /** The canonical record document (shared/records) whose hash was signed. */
  record: jsonb('record').notNull(),
  recordHash: text('record_hash').notNull(),
  frozenAt: timestamp('frozen_at', { withTimezone: true, mode: 'date' }).notNull(),
  frozenBy: uuid('frozen_by').notNull().references(() => people.id),
}, table => [
  uniqueIndex('entry_versions_entry_version').on(table.entryId, table.version),
  index('entry_versions_frozen').on(table.frozenAt),
])

/** Ed25519 public keys, kept forever; the secret key is stored only sealed. */
export const signingKeys = pgTable('signing_keys', {
  id: uuid('id').primaryKey().defaultRandom(),
  personId: uuid('person_id').notNull().references(() => people.id),
  publicKey: text('public_key').notNull(),
  fingerprint: text('fingerprint').notNull(),
  sealedSecretKey: jsonb('sealed_secret_key').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  retiredAt: timestamp('retired_at', { withTimezone: true, mode: 'date' }),
  retiredReason: text('retired_reason'),
  /**
   * A key may sign once confirmed. A person's first key is confirmed when it is registered; a
   * replacement waits (null) until a records officer other than its owner confirms it with a
   * reason (server/utils/signing.ts signingKeyMaySign decides).
   */
  confirmedAt: timestamp('confirmed_at', { withTimezone: true, mode: 'date' }),
  confirmedBy: uuid('confirmed_by').references(() => people.id),
  confirmationReason: text('confirmation_reason'),
}, table => [
  uniqueIndex('signing_keys_fingerprint').on(table.fingerprint),
  index('signing_keys_person').on(table.personId),
  // At most one active key per person.
  uniqueIndex('signing_keys_one_active').on(table.personId).where(sql`retired_at IS NULL`),
])

/** Single-use signing challenges: server time and nonce for a statement; expire in minutes. */
export const signingChallenges = pgTable('signing_challenges', {
  id: uuid('id').primaryKey().defaultRandom(),
  nonce: text('nonce').notNull(),
  personId: uuid('person_id').notNull().references(() => people.id),
  entryId: uuid('entry_id').notNull().references(() => entries.id),
  version: integer('version').notNull(),
  meaning: signingMeaningEnum('meaning').notNull(),
  recordHash: text('record_hash').notNull(),
  issuedAt: timestamp('issued_at', { withTimezone: true, mode: 'date' }).notNull(),
  expiresAt: timestamp('expires_at', { withTimezone: true, mode: 'date' }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true, mode: 'date' }),
}, table => [uniqueIndex('signing_challenges_nonce').on(table.nonce)])

/** A signature on a frozen entry version. Never updated or deleted. */
export const signatures = pgTable('signatures', {
  id: uuid('id').primaryKey().defaultRandom(),
  entryVersionId: uuid('entry_version_id').notNull().references(() => entryVersions.id),
  signerId: uuid('signer_id').notNull().references(() => people.id),
  keyId: uuid('key_id').notNull().references(() => signingKeys.id),
  meaning: signingMeaningEnum('meaning').notNull(),
  statement: jsonb('statement').notNull(),
  statementHash: text('statement_hash').notNull(),
  signature: text('signature').notNull(),
  signedAt: timestamp('signed_at', { withTimezone: true, mode: 'date' }).notNull(),
  countersignsId: uuid('countersigns_id'),
}, table => [
  index('signatures_version').on(table.entryVersionId),
  index('signatures_signer').on(table.signerId),
  // One author signature and one countersignature per version: parallel witnesses race here.
  uniqueIndex('signatures_one_author').on(table.entryVersionId).where(sql`meaning = 'authored'`),
  uniqueIndex('signatures_one_witness').on(table.entryVersionId).where(sql`meaning = 'witnessed'`),
])

/** An author's request that a named witness countersign a version; resolved once. */
export const witnessRequests = pgTable('witness_requests', {
  id: uuid('id').primaryKey().defaultRandom(),
  entryId: uuid('entry_id').notNull().references(() => entries.id),
  version: integer('version').notNull(),
  requestedBy: uuid('requested_by').notNull().references(() => people.id),
  witnessId: uuid('witness_id').notNull().references(() => people.id),
  requestedAt: timestamp('requested_at', { withTimezone: true, mode: 'date' }).notNull().defaultNow(),
  resolvedAt: timestamp('resolved_at', { withTimezone: true, mode: 'date' }),
  outcome: text('outcome'),
  reason: text('reason'),
}, table => [index('witness_requests_witness').on(table.witnessId), index('witness_requests_entry').on(table.entryId)])

export const exportStatusEnum = pgEnum('export_status', ['queued', 'running', 'done', 'failed', 'cancelled'])

/** A bulk export run as a job, resumable after a restart. */
export const exportJobs = pgTable('export_jobs', {
  id: uuid('id').primaryKey().defaultRandom(),
  requestedBy: uuid('requested_by').notNull().references(() => people.id),
  parameters: jsonb('parameters').notNull(),
  status: exportStatusEnum('status').notNull().default('queued'),
  total: integer('total').notNull().default(0),
  done: integer('done').notNull().default(0),
  storageKey: text('storage_key'),
  error: text('error'),
  createdAt,
  startedAt: timestamp('started_at', { withTimezone: true, mode: 'date' }),
  finishedAt: timestamp('finished_at', { withTimezone: true, mode: 'date' }),
  heartbeatAt: timestamp('heartbeat_at', { withTimezone: true, mode: 'date' }),
}, table => [index('export_jobs_status').on(table.status)])

/** Bearer tokens for host systems: only a hash is stored; shown once at issue. */
export const apiTokens = pgTable('api_tokens', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  tokenHash: text('token_hash').notNull(),
  prefix: text('prefix').notNull(),
  scopes: text('scopes').array().notNull(),
  createdBy: uuid('created_by').notNull().references(() => people.id),
  /** The person the token acts for (their notebooks and roles bound what it can reach). */
  actsFor: uuid('acts_for').notNull().references(() => people.id),
  createdAt,
  lastUsedAt: timestamp('last_used_at', { withTimezone: true, mode: 'date' }),
  revokedAt: timestamp('revoked_at', { withTimezone: true, mode: 'date' }),
}, table => [uniqueIndex('api_tokens_hash').on(table.tokenHash)])

export type Attachment = typeof attachments.$inferSelect
export type EntryVersion = typeof entryVersions.$inferSelect
export type SigningKey = typeof signingKeys.$inferSelect
export type Signature = typeof signatures.$inferSelect
export type SigningChallenge = typeof signingChallenges.$inferSelect
export type ExportJob = typeof exportJobs.$inferSelect
export type ApiToken = typeof apiTokens.$inferSelect
export type PasswordReset = typeof passwordResets.$inferSelect
