import { and, asc, desc, eq, gt, sql } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { auditEvents, entryEditSessions, type AuditEvent, type EntryEditSession } from '../database/schema'
import { auditRowHash, GENESIS_HASH } from '../database/audit-chain'
import type { Database } from './db'
import { READ_ONLY_RECORD_ACTIONS } from './recordBundle'
import { compareWithCheckpoints, type CheckpointComparison } from './auditAnchor'

const AUDIT_LOCK = 874202
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i

export interface AuditInput {
  action: string
  actorId?: string | null
  actorEmail?: string | null
  subjectType?: string | null
  subjectId?: string | null
  details?: Record<string, unknown>
}

type Executor = Pick<Database, 'execute' | 'select' | 'insert' | 'delete'>

/** The action of one editing session's autosaves, appended when the session closes. */
export const ENTRY_EDITED = 'entry_edited'

/**
 * Closes an editing session: deletes its row and appends its one `entry_edited` event, in the
 * caller's transaction. The conditional DELETE decides who closes it, so a save, another
 * event and the idle sweep on several servers never append the same session twice.
 */
export async function closeEditSession(tx: Executor, session: Pick<EntryEditSession, 'entryId' | 'startedAt'>, closedBy: 'next_session' | 'other_event' | 'idle', idleMinutes?: number): Promise<AuditEvent | null> {
  const [closed] = await tx.delete(entryEditSessions).where(and(
    eq(entryEditSessions.entryId, session.entryId), eq(entryEditSessions.startedAt, session.startedAt),
    // The sweep re-checks idleness on the row it deletes: a save that just landed keeps its session open.
    idleMinutes === undefined ? undefined : sql`${entryEditSessions.lastSavedAt} < now() - make_interval(mins => ${idleMinutes})`,
  )).returning()
  if (!closed) return null
  return appendInTransaction(tx, {
    action: ENTRY_EDITED, actorId: closed.personId, actorEmail: closed.personEmail, subjectType: 'entry', subjectId: closed.entryId,
    details: {
      version: closed.version, saves: closed.saves,
      firstSavedAt: closed.startedAt.toISOString(), lastSavedAt: closed.lastSavedAt.toISOString(),
      firstContentHash: closed.firstContentHash, lastContentHash: closed.lastContentHash,
      fromLockVersion: closed.firstLockVersion, toLockVersion: closed.lastLockVersion,
      titleChanged: closed.titleChanged, closedBy,
    },
  })
}

async function appendInTransaction(tx: Executor, input: AuditInput): Promise<AuditEvent> {
  // One writer at a time extends the chain, whichever app server it runs on.
  await tx.execute(sql`SELECT pg_advisory_xact_lock(${AUDIT_LOCK})`)
  // Anything else that happens to an entry (signing, a data file) first closes its open editing
  // session, so the trail reads "edited, then signed" in the order it happened. Reading a
  // record (PDF, bundle, verification) changes nothing and leaves the session open.
  const subjectId = input.subjectId ?? ''
  if (input.subjectType === 'entry' && input.action !== ENTRY_EDITED && !READ_ONLY_RECORD_ACTIONS.includes(input.action) && UUID.test(subjectId)) {
    const [open] = await tx.select({ entryId: entryEditSessions.entryId, startedAt: entryEditSessions.startedAt })
      .from(entryEditSessions).where(eq(entryEditSessions.entryId, subjectId)).limit(1)
    if (open) await closeEditSession(tx, open, 'other_event')
  }
  const [last] = await tx.select({ hash: auditEvents.hash }).from(auditEvents)
    .orderBy(desc(auditEvents.sequence)).limit(1)
  const row = {
    occurredAt: new Date(),
    actorId: input.actorId ?? null,
    actorEmail: input.actorEmail ?? null,
    action: input.action,
    subjectType: input.subjectType ?? null,
    subjectId: input.subjectId ?? null,
    details: input.details ?? {},
    previousHash: last?.hash ?? GENESIS_HASH,
  }
  const [inserted] = await tx.insert(auditEvents).values({ ...row, hash: auditRowHash(row) }).returning()
  return inserted!
}

/**
 * Append one audit event to the hash chain. Pass a transaction to make the event part of
 * the change it records (both land or neither does).
 */
export async function recordAudit(database: Database, input: AuditInput, transaction?: Executor): Promise<AuditEvent> {
  if (transaction)
    return appendInTransaction(transaction, input)
  return database.transaction(tx => appendInTransaction(tx, input))
}

/** Audit helper for a route: the actor is the signed-in person, if any. */
export async function auditFromEvent(event: H3Event, input: Omit<AuditInput, 'actorId' | 'actorEmail'>, transaction?: Executor) {
  const session = await getUserSession(event)
  const user = session.user as { id?: string, email?: string } | undefined
  return recordAudit(useDatabase(), { ...input, actorId: user?.id ?? null, actorEmail: user?.email ?? null }, transaction)
}

export interface ChainReport {
  ok: boolean
  checked: number
  lastHash: string
  /** sequence is null for a problem found against a checkpoint (truncation, rewrite). */
  problem: null | { sequence: number | null, message: string }
  /** The newest checkpoint (signed tree head) the log was compared with, and how many checkpoints held. */
  checkpoint: CheckpointComparison['newest']
  checkpointsChecked: number
}

/**
 * Walk the whole chain in order, recomputing each row's hash and its link to the row before;
 * then compare the log with every checkpoint signed with the records key (auditAnchor.ts), which
 * reveals truncation and rewrites that leave every link intact.
 */
export async function verifyAuditChain(database: Database, batchSize = 5000): Promise<ChainReport> {
  const walked = await walkAuditChain(database, batchSize)
  if (!walked.report.ok) return walked.report
  const anchored = await compareWithCheckpoints(database, walked.hashes)
  return {
    ...walked.report,
    ok: anchored.problem === null,
    problem: anchored.problem === null ? null : { sequence: null, message: anchored.problem },
    checkpoint: anchored.newest,
    checkpointsChecked: anchored.checked,
  }
}

async function walkAuditChain(database: Database, batchSize: number): Promise<{ report: ChainReport, hashes: string[] }> {
  const hashes: string[] = []
  const broken = (checked: number, lastHash: string, sequence: number, message: string) =>
    ({ report: { ok: false, checked, lastHash, problem: { sequence, message }, checkpoint: null, checkpointsChecked: 0 }, hashes })
  let previousHash = GENESIS_HASH
  let after = 0
  let checked = 0
  for (;;) {
    const rows = await database.select().from(auditEvents)
      .where(gt(auditEvents.sequence, after)).orderBy(asc(auditEvents.sequence)).limit(batchSize)
    for (const row of rows) {
      if (row.previousHash !== previousHash)
        return broken(checked, previousHash, row.sequence, `event ${row.sequence} does not link to the event before it (a row was removed, inserted or reordered)`)
      const { sequence: _sequence, hash, ...rest } = row
      if (auditRowHash(rest) !== hash)
        return broken(checked, previousHash, row.sequence, `event ${row.sequence} was changed after it was written: its contents no longer match its hash`)
      hashes.push(hash)
      previousHash = hash
      checked++
      after = row.sequence
    }
    if (rows.length < batchSize)
      break
  }
  return { report: { ok: true, checked, lastHash: previousHash, problem: null, checkpoint: null, checkpointsChecked: 0 }, hashes }
}
