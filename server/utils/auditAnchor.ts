import { asc, desc, eq, and, gte, sql } from 'drizzle-orm'
import {
  CHECKPOINT_SCHEMA, CheckpointSchema, openRecordsKeyDocument, type ProvenAuditEvent, type RecordsKeyDocument,
} from '../../shared/records'
import { auditCheckpoints, auditEvents, people, type AuditCheckpoint } from '../database/schema'
import type { Database } from './db'
import { ed25519Verify } from './ed25519'
import { MerkleTree } from './merkleTree'
import { loadRecordsKey, signWithRecordsKey } from './recordsKey'

// The audit log anchored outside the database (DESIGN.md "Trust anchors"): checkpoints are
// signed tree heads (RFC 9162 §2.1) of the log, signed with the records key. A record's bundle
// carries its events with inclusion proofs in a checkpoint; the chain check compares the log
// with every checkpoint, so removing the last events (truncation) or removing one and
// recomputing every later hash (a rewrite) is reported even though the links still hold.

/** The advisory lock every audit writer holds (server/utils/audit.ts): a checkpoint reads a log nobody is extending. */
const AUDIT_LOCK = 874202

type Reader = Pick<Database, 'select'>

/** Every event's sequence and hash, in log order: the Merkle leaves. */
export async function auditLeaves(database: Reader): Promise<{ sequences: number[], hashes: string[] }> {
  const rows = await database.select({ sequence: auditEvents.sequence, hash: auditEvents.hash }).from(auditEvents).orderBy(asc(auditEvents.sequence))
  return { sequences: rows.map(row => row.sequence), hashes: rows.map(row => row.hash) }
}

const treeOf = (hashes: string[]) => new MerkleTree(hashes.map(hash => Buffer.from(hash, 'hex')))

/** A checkpoint row as the records-key document it was published as. */
export function checkpointDocument(row: Pick<AuditCheckpoint, 'payload' | 'signature' | 'recordsKey'>): RecordsKeyDocument {
  return { payload: row.payload, signature: row.signature, recordsKey: row.recordsKey }
}

/**
 * Signs a checkpoint of the whole log now, unless the newest already covers it. Null when no
 * records key is configured. Holds the audit lock, so the head it signs is the log's head.
 */
export async function signAuditCheckpoint(database: Database): Promise<AuditCheckpoint | null> {
  const key = loadRecordsKey()
  if (!key) return null
  return await database.transaction(async (tx) => {
    await tx.execute(sql`SELECT pg_advisory_xact_lock(${AUDIT_LOCK})`)
    const { sequences, hashes } = await auditLeaves(tx)
    const [newest] = await tx.select().from(auditCheckpoints).orderBy(desc(auditCheckpoints.treeSize), desc(auditCheckpoints.id)).limit(1)
    if (newest && newest.treeSize === hashes.length) return newest
    const signedAt = new Date()
    const content = { schema: CHECKPOINT_SCHEMA, treeSize: hashes.length, rootHash: treeOf(hashes).root().toString('hex'), signedAt: signedAt.toISOString(), recordsKey: key.fingerprint }
    const document = signWithRecordsKey(key, content)
    const [row] = await tx.insert(auditCheckpoints).values({
      treeSize: content.treeSize, lastSequence: sequences.at(-1) ?? 0, rootHash: content.rootHash, signedAt,
      recordsKey: document.recordsKey, payload: document.payload, signature: document.signature,
    }).returning()
    return row!
  })
}

export async function auditCheckpointList(database: Reader, limit = 100): Promise<AuditCheckpoint[]> {
  return await database.select().from(auditCheckpoints).orderBy(desc(auditCheckpoints.treeSize), desc(auditCheckpoints.id)).limit(limit)
}

export interface CheckpointComparison {
  /** The newest checkpoint, as checked. */
  newest: { treeSize: number, rootHash: string, signedAt: string } | null
  checked: number
  /** The first problem: truncation, rewrite, or a checkpoint not signed by the records key. */
  problem: string | null
}

/**
 * Compares the log (its event hashes in order) with every stored checkpoint, newest first: each
 * must be signed by the records key, cover no more events than the log holds (else the end was
 * cut off), and its root must be the root of the log's first treeSize events (else an event
 * among them was removed, inserted or changed, whatever the links say now).
 */
export async function compareWithCheckpoints(database: Reader, hashes: string[]): Promise<CheckpointComparison> {
  const rows = await auditCheckpointList(database, 1000)
  const newest = rows[0] ? { treeSize: rows[0].treeSize, rootHash: rows[0].rootHash, signedAt: rows[0].signedAt.toISOString() } : null
  if (rows.length === 0) return { newest, checked: 0, problem: null }
  const key = loadRecordsKey()
  const tree = treeOf(hashes)
  let checked = 0
  for (const row of rows) {
    const when = row.signedAt.toISOString()
    const opened = await openRecordsKeyDocument(checkpointDocument(row), CheckpointSchema, 'checkpoint', ed25519Verify, key?.fingerprint)
    if (!opened.ok)
      return { newest, checked, problem: `the checkpoint signed at ${when} does not hold: ${opened.problems.join('; ')}` }
    if (opened.content.treeSize !== row.treeSize || opened.content.rootHash !== row.rootHash)
      return { newest, checked, problem: `the checkpoint signed at ${when} was changed in the database: its stored size or root differs from what the records key signed` }
    if (row.treeSize > hashes.length) {
      const missing = row.treeSize - hashes.length
      return { newest, checked, problem: `the audit log was truncated: the checkpoint signed at ${when} covers ${row.treeSize} events, but the log now holds ${hashes.length} (${missing} event${missing === 1 ? '' : 's'} removed)` }
    }
    if (tree.root(row.treeSize).toString('hex') !== row.rootHash)
      return { newest, checked, problem: `the audit log was rewritten: its first ${row.treeSize} events no longer hash to the root ${row.rootHash} that the checkpoint signed at ${when} covers (an event was removed, inserted or changed and the later hashes recomputed)` }
    checked++
  }
  return { newest, checked, problem: null }
}

/**
 * The entry's audit events (read-only actions left out, as the PDF leaves them out) with their
 * inclusion proofs in the first checkpoint that covers them all, signing one when none does.
 * Without a records key the events travel unanchored (checkpoint null, empty proofs).
 */
export async function provenEntryEvents(database: Database, entryId: string, readOnlyActions: string[]): Promise<{ events: ProvenAuditEvent[], checkpoint: RecordsKeyDocument | null }> {
  const rows = await database.select({ event: auditEvents, actorName: people.name }).from(auditEvents)
    .leftJoin(people, eq(people.id, auditEvents.actorId))
    .where(and(eq(auditEvents.subjectType, 'entry'), eq(auditEvents.subjectId, entryId)))
    .orderBy(asc(auditEvents.sequence)).limit(1000)
  const kept = rows.filter(row => !readOnlyActions.includes(row.event.action))
  if (kept.length === 0) return { events: [], checkpoint: null }
  const last = kept.at(-1)!.event.sequence
  const [position] = await database.select({ count: sql<number>`count(*)::int` }).from(auditEvents).where(sql`${auditEvents.sequence} <= ${last}`)
  const needed = position!.count
  let [covering] = await database.select().from(auditCheckpoints).where(gte(auditCheckpoints.treeSize, needed))
    .orderBy(asc(auditCheckpoints.treeSize), asc(auditCheckpoints.id)).limit(1)
  covering ??= (await signAuditCheckpoint(database)) ?? undefined
  const { sequences, hashes } = await auditLeaves(database)
  const index = new Map(sequences.map((sequence, position) => [sequence, position]))
  const tree = covering && covering.treeSize <= hashes.length ? treeOf(hashes) : null
  const events = kept.map(({ event, actorName }) => {
    const leafIndex = index.get(event.sequence)!
    const proof = tree && covering && leafIndex < covering.treeSize ? tree.inclusionProof(leafIndex, covering.treeSize).map(node => node.toString('hex')) : []
    return {
      sequence: event.sequence, occurredAt: event.occurredAt.toISOString(), actorId: event.actorId, actorEmail: event.actorEmail,
      actorName: actorName ?? null, action: event.action, subjectType: event.subjectType, subjectId: event.subjectId,
      details: event.details as ProvenAuditEvent['details'], previousHash: event.previousHash, hash: event.hash, leafIndex, proof,
    }
  })
  return { events, checkpoint: covering ? checkpointDocument(covering) : null }
}

/** A consistency proof (RFC 9162 §2.1.4) between two tree sizes of the log as it is now. */
export async function auditConsistencyProof(database: Reader, first: number, second: number): Promise<{ first: number, second: number, firstRoot: string, secondRoot: string, proof: string[] }> {
  const { hashes } = await auditLeaves(database)
  if (second > hashes.length || first > second)
    throw createError({ statusCode: 400, message: `second: the log holds ${hashes.length} events; ask for 0 ≤ first ≤ second ≤ ${hashes.length}`, data: { issues: [{ path: 'second', message: `at most ${hashes.length}` }] } })
  const tree = treeOf(hashes)
  return { first, second, firstRoot: tree.root(first).toString('hex'), secondRoot: tree.root(second).toString('hex'), proof: tree.consistencyProof(first, second).map(node => node.toString('hex')) }
}
